/**
 * Tolerance sampling: the actual part values of one Monte Carlo trial.
 *
 * Model (Lotwise's own, stated here in full). Each part has a half-width h (SI units):
 * h = tolerance·value, or h = toleranceAbs when given (absolute tolerances such as ±0.25 pF).
 * A trial's value is  nominal + h·d,  d ∈ [−1, 1], where
 *
 *   d = u_own                                        (part without a lot)
 *   d = clip(√ρ·u_lot + √(1−ρ)·u_own, −1, 1)          (part in a lot; every part of the lot shares u_lot)
 *
 * and each standardized variate u is drawn from the part's distribution:
 * - normal (default): u = z/k with z standard normal truncated to |z| ≤ k (k = 3: tolerance = 3σ,
 *   truncated at ±tolerance). Truncation is done by inverse transform, z = Φ⁻¹(Φ(−k) + v·(Φ(k) − Φ(−k))),
 *   which is exactly the truncated law (the same law rejection sampling gives) but consumes exactly one
 *   uniform v per variate; see below why that matters.
 * - uniform: u = 2v − 1.
 * ρ (`lotCorrelation`, default 0.9) is therefore the correlation between two parts of the same lot
 * (cov = ρ·var u, var d = var u before clipping); clipping at ±1 only touches draws beyond the
 * tolerance (≈ 0.5 % of lot draws at ρ = 0.9 for normal parts). The lot draw of a uniform part is the
 * lot's uniform v mapped by the part's own distribution, so a lot may mix distributions.
 *
 * Stream layout of a trial (see random.ts): v_0 … v_(P−1) for parts 0..P−1 in netlist order (drawn even
 * for exact parts), then one v per lot in order of first appearance. Because every variate uses
 * exactly one uniform at a fixed position, changing one part's tolerance, distribution or lot leaves
 * every other part's draw unchanged: what-if comparisons between grades use common random numbers.
 *
 * Temperature is not applied here: the solver's evaluate(values, tempC) applies each part's tempco.
 */
import { EngineError } from "./errors";
import type { Netlist } from "./netlist";
import type { UniformSource } from "./random";
import { normalCdf, normalQuantileFast } from "./stats/normal";

/** Default correlation between two parts of the same lot. */
export const DEFAULT_LOT_CORRELATION = 0.9;
/** Default number of standard deviations in a normal tolerance (tolerance = 3σ). */
export const DEFAULT_TOLERANCE_SIGMAS = 3;

/** Run-level sampling options. */
export interface SamplingOptions {
  /** correlation ρ between parts of one lot, 0..1 (default 0.9) */
  lotCorrelation?: number;
  /** k in tolerance = kσ for normal parts, 1..6 (default 3) */
  toleranceSigmas?: number;
}

/** Everything a trial needs to sample part values, fixed once per run. */
export interface SamplingPlan {
  readonly partCount: number;
  readonly refs: readonly string[];
  readonly nominal: Float64Array;
  /** half-width h per part (SI units); 0 for exact parts */
  readonly halfWidth: Float64Array;
  /** 0 = normal, 1 = uniform */
  readonly uniform: Uint8Array;
  /** lot number per part, −1 for none */
  readonly lotOf: Int32Array;
  readonly lotNames: readonly string[];
  readonly sqrtRho: number;
  readonly sqrtOneMinusRho: number;
  readonly sigmas: number;
  /** Φ(−k) and Φ(k) − Φ(−k) of the truncated normal */
  readonly cdfLow: number;
  readonly cdfSpan: number;
}

/**
 * Fixes the sampling model of a run.
 * @param netlist a netlist already accepted by compileNetlist
 * @param options lot correlation and σ count
 * @throws EngineError INVALID_NETLIST (path "parts[k].tolerance" / ".toleranceAbs" / ".distribution") when a
 *   tolerance would let a value reach zero or is not a finite number ≥ 0; INVALID_INPUT for bad options
 */
export function compileSampling(netlist: Netlist, options: SamplingOptions = {}): SamplingPlan {
  const rho = options.lotCorrelation ?? DEFAULT_LOT_CORRELATION;
  const sigmas = options.toleranceSigmas ?? DEFAULT_TOLERANCE_SIGMAS;
  if (typeof rho !== "number" || !(rho >= 0 && rho <= 1)) throw new EngineError("INVALID_INPUT", "`lotCorrelation` must be between 0 and 1", { path: "lotCorrelation" });
  if (typeof sigmas !== "number" || !(sigmas >= 1 && sigmas <= 6)) throw new EngineError("INVALID_INPUT", "`toleranceSigmas` must be between 1 and 6", { path: "toleranceSigmas" });
  const P = netlist.parts.length;
  const nominal = new Float64Array(P);
  const halfWidth = new Float64Array(P);
  const uniform = new Uint8Array(P);
  const lotOf = new Int32Array(P).fill(-1);
  const lotNames: string[] = [];
  netlist.parts.forEach((part, k) => {
    nominal[k] = part.value;
    halfWidth[k] = partHalfWidth(part, k);
    const dist = part.distribution ?? "normal";
    if (dist !== "normal" && dist !== "uniform") throw new EngineError("INVALID_NETLIST", `${part.ref}: distribution must be "normal" or "uniform"`, { path: `parts[${k}].distribution` });
    uniform[k] = dist === "uniform" ? 1 : 0;
    if (part.lot !== undefined && part.lot !== "") {
      let l = lotNames.indexOf(part.lot);
      if (l < 0) l = lotNames.push(part.lot) - 1;
      lotOf[k] = l;
    }
  });
  const cdfLow = normalCdf(-sigmas);
  return {
    partCount: P, refs: netlist.parts.map((p) => p.ref), nominal, halfWidth, uniform, lotOf, lotNames,
    sqrtRho: Math.sqrt(rho), sqrtOneMinusRho: Math.sqrt(1 - rho), sigmas, cdfLow, cdfSpan: normalCdf(sigmas) - cdfLow,
  };
}

/**
 * Samples one trial's part values (no allocation).
 * @param plan from compileSampling
 * @param random the trial's uniform stream (createTrialStream(seed, index))
 * @param values out: actual values (SI), length partCount
 * @param deviations optional out: relative deviations (value − nominal)/nominal
 * @param lotDraws scratch of length ≥ lot count (uniform v per lot)
 */
export function sampleTrial(plan: SamplingPlan, random: UniformSource, values: Float64Array, deviations?: Float64Array, lotDraws?: Float64Array): void {
  const P = plan.partCount;
  for (let k = 0; k < P; k++) values[k] = random(); // own uniforms first, in netlist order
  const L = plan.lotNames.length;
  const lots = lotDraws ?? new Float64Array(L);
  for (let l = 0; l < L; l++) lots[l] = random();
  for (let k = 0; k < P; k++) {
    const h = plan.halfWidth[k];
    let d = standardize(plan, k, values[k]);
    const l = plan.lotOf[k];
    if (l >= 0) {
      d = plan.sqrtRho * standardize(plan, k, lots[l]) + plan.sqrtOneMinusRho * d;
      d = d > 1 ? 1 : d < -1 ? -1 : d;
    }
    const v = plan.nominal[k] + h * d;
    values[k] = v;
    if (deviations) deviations[k] = (v - plan.nominal[k]) / plan.nominal[k];
  }
}

/** Maps a uniform v ∈ [0, 1) to the part's standardized variate u ∈ [−1, 1]. */
function standardize(plan: SamplingPlan, k: number, v: number): number {
  if (plan.uniform[k] === 1) return 2 * v - 1;
  const z = normalQuantileFast(plan.cdfLow + v * plan.cdfSpan);
  const u = z / plan.sigmas;
  return u > 1 ? 1 : u < -1 ? -1 : u;
}

function partHalfWidth(part: Netlist["parts"][number], k: number): number {
  if (part.toleranceAbs !== undefined) {
    const a = part.toleranceAbs;
    if (typeof a !== "number" || !Number.isFinite(a) || a < 0) throw new EngineError("INVALID_NETLIST", `${part.ref}: toleranceAbs must be a finite number ≥ 0`, { path: `parts[${k}].toleranceAbs` });
    if (a >= part.value) throw new EngineError("INVALID_NETLIST", `${part.ref}: toleranceAbs (${a}) must be smaller than the value (${part.value})`, { path: `parts[${k}].toleranceAbs` });
    return a;
  }
  const t = part.tolerance ?? 0;
  if (typeof t !== "number" || !Number.isFinite(t) || t < 0 || t >= 1) throw new EngineError("INVALID_NETLIST", `${part.ref}: tolerance must be a fraction 0 ≤ t < 1`, { path: `parts[${k}].tolerance` });
  return t * part.value;
}
