/**
 * The fixed plan of a Monte Carlo run: everything derived from the inputs alone, before any trial
 * runs, identically in every worker (compiled netlist, rules on the grid, sampling model, nominal
 * response, histogram edges). Because it depends only on the inputs, chunks computed on different
 * workers bin their data on the same edges and merge exactly.
 *
 * Margin histogram edges (per rule): with m0 the nominal margin (worst over corners, nominal values)
 * and a = max(|m0|, 0.5) in the rule's unit (dB or ns): lo = min(0, m0) − a, hi = max(0, m0) + a,
 * `histogramBins` equal bins (default 60). The window holds the limit (0), the nominal and as much
 * again on either side; values beyond fall into underflow/overflow counts.
 *
 * Envelope windows (per S-parameter pair and grid point): nominal |S| dB ± `envelopeSpanDb` (default
 * 6 dB) in bins of `envelopeBinDb` (default 0.02 dB), plus underflow/overflow. If pairs × points ×
 * bins would exceed 4,000,000 cells the bin width is widened to stay within it (memory stays bounded
 * whatever the grid); the bin width actually used is reported with the envelopes.
 */
import { EngineError } from "./errors";
import { buildFrequencyGrid, type FrequencyGrid } from "./frequency-grid";
import { validateLimits } from "./limits";
import type { Netlist } from "./netlist";
import { resolveRunOptions, type ResolvedRunOptions } from "./run-options";
import { evaluateMargins, magDb, type BoundRule } from "./rules";
import { compileSampling, type SamplingPlan } from "./sampling";
import { compileNetlist, createSweepEvaluator, nominalValues, type CompiledNetlist, type SweepEvaluator } from "./solver";
import type { HistogramEdges } from "./stats/histogram";

/** Envelope cells budget (pairs × points × (bins + 2)). */
export const ENVELOPE_CELL_BUDGET = 4_000_000;

/** One S-parameter pair, zero-based. */
export interface PortPair {
  i: number;
  j: number;
  /** metric name, e.g. "s21_db" */
  name: string;
}

/** The run's fixed plan. */
export interface RunPlan {
  readonly netlist: Netlist;
  readonly compiled: CompiledNetlist;
  readonly options: ResolvedRunOptions;
  readonly rules: readonly BoundRule[];
  readonly grid: FrequencyGrid;
  readonly sampling: SamplingPlan;
  readonly evaluator: SweepEvaluator;
  readonly pairs: readonly PortPair[];
  /** nominal margins, worst over corners */
  readonly nominalMargins: Float64Array;
  /** nominal |S| dB at 25 °C, index pair·F + f */
  readonly nominalDb: Float64Array;
  readonly marginEdges: readonly HistogramEdges[];
  readonly envelopeBins: number;
  readonly envelopeBinDb: number;
}

/**
 * Validates the inputs and builds the plan.
 * @throws EngineError INVALID_NETLIST / INVALID_LIMITS / INVALID_INPUT, or SINGULAR_MATRIX when even the
 *   nominal circuit cannot be solved
 */
export function planRun(netlist: Netlist, limits: unknown, options: unknown): RunPlan {
  const { compiled, compiledRules, resolved, grid, sampling } = checkInputs(netlist, limits, options);
  const rules: BoundRule[] = compiledRules.map((rule, k) => ({ rule, start: grid.ranges[k].start, end: grid.ranges[k].end }));
  const evaluator = createSweepEvaluator(compiled, grid.freqs);
  const P = compiled.portCount;
  const pairs: PortPair[] = [];
  for (let i = 0; i < P; i++) for (let j = 0; j < P; j++) pairs.push({ i, j, name: `s${i + 1}${j + 1}_db` });

  const nominal = nominalValues(compiled);
  const F = grid.freqs.length;
  const nominalMargins = new Float64Array(rules.length).fill(Infinity);
  const scratch = new Float64Array(rules.length);
  for (const t of resolved.corners) {
    evaluateMargins(evaluator.evaluate(nominal, t), rules, scratch);
    for (let r = 0; r < rules.length; r++) nominalMargins[r] = Math.min(nominalMargins[r], scratch[r]);
  }
  const buffers = evaluator.evaluate(nominal, 25);
  const nominalDb = new Float64Array(pairs.length * F);
  pairs.forEach((p, k) => {
    for (let f = 0; f < F; f++) nominalDb[k * F + f] = Math.max(-400, magDb(buffers.s, ((f * P + p.i) * P + p.j) * 2));
  });
  const marginEdges = rules.map((_, r) => marginHistogramEdges(nominalMargins[r], resolved.histogramBins));
  let envelopeBins = Math.max(2, Math.round((2 * resolved.envelopeSpanDb) / resolved.envelopeBinDb));
  const maxBins = Math.floor(ENVELOPE_CELL_BUDGET / (pairs.length * F)) - 2;
  if (envelopeBins > maxBins) envelopeBins = Math.max(2, maxBins);
  return {
    netlist, compiled, options: resolved, rules, grid, sampling, evaluator, pairs, nominalMargins, nominalDb, marginEdges,
    envelopeBins, envelopeBinDb: (2 * resolved.envelopeSpanDb) / envelopeBins,
  };
}

/** What a driver needs of a run without planning it (no solve): the resolved options and the sizes that set its cost. */
export interface RunShape {
  readonly options: ResolvedRunOptions;
  /** grid points (the sweep plus the rules' band edges) */
  readonly points: number;
  readonly parts: number;
}

/**
 * Validates the inputs as planRun does, short of solving the nominal circuit, and returns the run's shape: cheap
 * enough for the thread that answers requests (a large run's plan takes seconds; the workers build it).
 * @throws EngineError INVALID_NETLIST / INVALID_LIMITS / INVALID_INPUT
 */
export function shapeRun(netlist: Netlist, limits: unknown, options: unknown): RunShape {
  const { resolved, grid, sampling } = checkInputs(netlist, limits, options);
  return { options: resolved, points: grid.freqs.length, parts: sampling.partCount };
}

/** Every check of a run's inputs, and what they compile to (no solve). */
function checkInputs(netlist: Netlist, limits: unknown, options: unknown) {
  if (typeof netlist !== "object" || netlist === null) throw new EngineError("INVALID_NETLIST", "netlist must be an object with `ports` and `parts`", { path: "netlist" });
  const compiled = compileNetlist(netlist);
  const compiledRules = validateLimits(limits, compiled.portCount);
  const resolved = resolveRunOptions(options, compiledRules);
  const grid = buildFrequencyGrid(resolved.sweep, compiledRules);
  const sampling = compileSampling(netlist, resolved);
  return { compiled, compiledRules, resolved, grid, sampling };
}

/** Part evaluations one trial costs: corners × grid points × parts (what chunk sizes and compute limits count). */
export function trialCost(shape: RunShape): number {
  return shape.options.corners.length * shape.points * shape.parts;
}

/** The shape of a planned run. */
export function shapeOf(plan: RunPlan): RunShape {
  return { options: plan.options, points: plan.grid.freqs.length, parts: plan.sampling.partCount };
}

/** Margin histogram edges from the nominal margin m0 (see the module comment). */
export function marginHistogramEdges(m0: number, bins: number): HistogramEdges {
  const a = Math.max(Math.abs(m0), 0.5);
  return { lo: Math.min(0, m0) - a, hi: Math.max(0, m0) + a, bins };
}
