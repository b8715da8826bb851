/**
 * Normalized doubly terminated all-pole low-pass prototypes (g0 = 1 ohm, ωc = 1 rad/s), computed by
 * formula (Butterworth, Chebyshev I) or by Darlington synthesis (Bessel–Thomson).
 */
import { EngineError } from "../errors";
import { findBracketedRoot, synthesizeAllPoleLadder } from "./darlington";
import type { FilterFamily, PrototypeValues } from "./types";

export const MAX_ORDER = 12;
export const MIN_RIPPLE_DB = 0.001;
export const MAX_RIPPLE_DB = 6;
const FAMILIES: readonly FilterFamily[] = ["butterworth", "chebyshev", "bessel"];

/**
 * g-values of the normalized low-pass prototype.
 *
 * - **Butterworth**: gk = 2 sin((2k−1)π/(2n)), g(n+1) = 1, w3dB = 1 (Pozar, Microwave Engineering 4th ed., sec. 8.3).
 * - **Chebyshev I** (ripple `rippleDb` = Lar): β = ln coth(Lar/(40/ln 10)), γ = sinh(β/(2n)),
 *   ak = sin((2k−1)π/(2n)), bk = γ² + sin²(kπ/n), g1 = 2a1/γ, gk = 4a(k−1)ak/(b(k−1)g(k−1));
 *   g(n+1) = 1 (n odd) or coth²(β/4) (n even) (Matthaei, Young & Jones 1964 sec. 4.05).
 *   The cutoff ωc = 1 is the **ripple band edge** (loss = Lar there); `w3dB` = cosh(acosh(1/ε)/n),
 *   ε² = 10^(Lar/10) − 1, is where the loss is 3.0103 dB (for Lar > 3.0103 dB, ε > 1, it is the last
 *   3 dB crossing below the edge, cos(acos(1/ε)/n)).
 * - **Bessel–Thomson** (maximally flat delay): Darlington synthesis of S21 = B(0)/B(s), B the reverse
 *   Bessel polynomial, ak = (2n−k)!/(2^(n−k) k! (n−k)!); values are **delay-normalized** (group delay
 *   1 s at DC, MYJ Table 4.07-1); `w3dB` is that prototype's −3 dB frequency in rad/s, so a caller
 *   scales by w3dB (g·w3dB) to put the −3 dB point at ωc = 1. Double precision holds at least 1e-9 in
 *   g up to n = 12 (checked against the response in the tests).
 *
 * @param family "butterworth" | "chebyshev" | "bessel"
 * @param order integer 1..12
 * @param rippleDb Chebyshev ripple in dB, 0.001..6 (required for chebyshev, ignored otherwise)
 * @returns g[0..n−1] = g1..gn, load = g(n+1) (resistance if gn is a shunt C, conductance if a series L), w3dB (rad/s)
 * @throws EngineError INVALID_INPUT naming `family`, `order` or `rippleDb`; NO_CONVERGENCE if the Bessel synthesis fails
 * @example prototypeValues("butterworth", 3) // returns { g: [1, 2, 1], load: 1, w3dB: 1 } (to rounding)
 * @example prototypeValues("chebyshev", 3, 0.5).g // returns ≈ [1.5963, 1.0967, 1.5963]
 */
export function prototypeValues(family: FilterFamily, order: number, rippleDb?: number): PrototypeValues {
  validatePrototypeInput(family, order, rippleDb);
  if (family === "butterworth") return butterworthPrototype(order);
  if (family === "chebyshev") return chebyshevPrototype(order, rippleDb as number);
  return besselPrototype(order);
}

/** Messages name the parameter; `path` carries its name for UIs. */
export function validatePrototypeInput(family: unknown, order: unknown, rippleDb: unknown): void {
  if (!FAMILIES.includes(family as FilterFamily)) {
    throw new EngineError("INVALID_INPUT", `family must be one of ${FAMILIES.join(", ")} (got ${String(family)})`, {
      path: "family",
    });
  }
  if (typeof order !== "number" || !Number.isInteger(order) || order < 1 || order > MAX_ORDER) {
    throw new EngineError("INVALID_INPUT", `order must be an integer from 1 to ${MAX_ORDER} (got ${String(order)})`, {
      path: "order",
    });
  }
  if (family === "chebyshev") {
    if (rippleDb === undefined) {
      throw new EngineError("INVALID_INPUT", "rippleDb is required for a chebyshev prototype", { path: "rippleDb" });
    }
    if (typeof rippleDb !== "number" || !Number.isFinite(rippleDb) || rippleDb < MIN_RIPPLE_DB || rippleDb > MAX_RIPPLE_DB) {
      throw new EngineError(
        "INVALID_INPUT",
        `rippleDb must be a number from ${MIN_RIPPLE_DB} to ${MAX_RIPPLE_DB} dB (got ${String(rippleDb)})`,
        { path: "rippleDb" },
      );
    }
  }
}

function butterworthPrototype(n: number): PrototypeValues {
  const g: number[] = [];
  for (let k = 1; k <= n; k++) g.push(2 * Math.sin(((2 * k - 1) * Math.PI) / (2 * n)));
  return { g, load: 1, w3dB: 1 };
}

function chebyshevPrototype(n: number, rippleDb: number): PrototypeValues {
  // 40/ln 10 = 17.3718 exactly, not the rounded 17.37 of printed tables.
  const beta = Math.log(1 / Math.tanh((rippleDb * Math.LN10) / 40));
  const gamma = Math.sinh(beta / (2 * n));
  const a = (k: number) => Math.sin(((2 * k - 1) * Math.PI) / (2 * n));
  const b = (k: number) => gamma * gamma + Math.sin((k * Math.PI) / n) ** 2;
  const g = [(2 * a(1)) / gamma];
  for (let k = 2; k <= n; k++) g.push((4 * a(k - 1) * a(k)) / (b(k - 1) * g[k - 2]));
  const load = n % 2 === 1 ? 1 : 1 / Math.tanh(beta / 4) ** 2;
  const eps = Math.sqrt(Math.pow(10, rippleDb / 10) - 1);
  const w3dB = eps <= 1 ? Math.cosh(Math.acosh(1 / eps) / n) : Math.cos(Math.acos(1 / eps) / n);
  return { g, load, w3dB };
}

/** Reverse Bessel polynomial coefficients (ascending), a_n = 1, a_k = a_(k+1)(2n−k)(k+1)/(2(n−k)) (exact integers). */
export function reverseBesselCoefficients(n: number): number[] {
  const a = new Array<number>(n + 1);
  a[n] = 1;
  for (let k = n - 1; k >= 0; k--) a[k] = (a[k + 1] * (2 * n - k) * (k + 1)) / (2 * (n - k));
  return a;
}

function besselPrototype(n: number): PrototypeValues {
  const a = reverseBesselCoefficients(n);
  // p = s/c with c = a0^(1/n) makes the polynomial monic with b0 = bn = 1: balanced coefficients keep
  // the continued fraction accurate. Elements scale back as g = g̃/c.
  const c = Math.pow(a[0], 1 / n);
  const b = a.map((v, k) => (v * Math.pow(c, k)) / a[0]);
  b[0] = 1;
  b[n] = 1;
  const ladder = synthesizeAllPoleLadder(b);
  if (!(Math.abs(ladder.load - 1) < 1e-9)) {
    throw new EngineError("NO_CONVERGENCE", `Bessel synthesis lost precision at order ${n} (load ${ladder.load})`);
  }
  // |B(jν)|² − 2 = 0 at the −3 dB point; |B(jν)|² rises monotonically from 1 at ν = 0.
  const excess = (nu: number) => magnitudeSquared(b, nu) - 2;
  let hi = 1;
  while (excess(hi) < 0) hi *= 2;
  const nu3 = findBracketedRoot(excess, 0, hi);
  // Equal terminations by construction; the computed remainder is 1 to ~1e-12.
  return { g: ladder.g.map((v) => v / c), load: 1, w3dB: nu3 * c };
}

function magnitudeSquared(b: readonly number[], omega: number): number {
  let re = 0;
  let im = 0;
  let power = 1;
  for (let k = 0; k < b.length; k++) {
    // (jω)^k cycles 1, j, −1, −j
    const term = b[k] * power;
    const phase = k % 4;
    if (phase === 0) re += term;
    else if (phase === 1) im += term;
    else if (phase === 2) re -= term;
    else im -= term;
    power *= omega;
  }
  return re * re + im * im;
}
