/**
 * The frequency grid of a sweep, with every rule's band edges merged in exactly.
 *
 * Sweep points: log scale f_k = from·(to/from)^(k/(N−1)); linear f_k = from + (to − from)·k/(N−1),
 * k = 0..N−1, with f_0 = from and f_(N−1) = to exactly. Band edges are then merged: a sweep point
 * within a relative 1e-9 of an edge is replaced by the edge (so no two grid points are closer than
 * that, which keeps group delay by differencing well conditioned), the rest are sorted and exact
 * duplicates removed. A band edge outside [from, to] extends the grid. Each rule covers the grid
 * indices [start, end) of the points with from ≤ f ≤ to (inclusive of both edges).
 */
import { EngineError } from "./errors";

/** Fewest and most sweep points. */
export const MIN_POINTS = 2;
export const MAX_POINTS = 10001;
/**
 * Frequencies the engine accepts: 1 mHz to 1 THz (a wide bracket around any LC filter; beyond it 2πf·L or 1/(2πf·C)
 * leaves the range where the nodal solution is finite). Zero is allowed as the start of a linear sweep (DC).
 */
export const MIN_FREQUENCY_HZ = 1e-3;
export const MAX_FREQUENCY_HZ = 1e12;

/** A sweep request. */
export interface SweepSpec {
  /** first frequency (Hz) */
  from: number;
  /** last frequency (Hz) */
  to: number;
  /** number of sweep points, 2..10001 */
  points: number;
  /** spacing, default "log" */
  scale?: "log" | "lin";
}

/** A band [from, to] in Hz. */
export interface Band {
  from: number;
  to: number;
}

/** The grid and the index range each band covers. */
export interface FrequencyGrid {
  freqs: Float64Array;
  /** per band: grid indices [start, end) */
  ranges: { start: number; end: number }[];
}

const EDGE_SNAP = 1e-9;

/**
 * Builds the grid.
 * @param sweep the sweep spec (validated here)
 * @param bands rule bands whose edges must be grid points (assumed valid: from < to, positive)
 * @throws EngineError INVALID_INPUT naming the sweep field
 * @example buildFrequencyGrid({ from: 1e6, to: 1e9, points: 4 }, [{ from: 2e6, to: 1e7 }]).freqs
 * // [1e6, 2e6, 1e7, 1e8, 1e9]
 */
export function buildFrequencyGrid(sweep: SweepSpec, bands: readonly Band[] = []): FrequencyGrid {
  validateSweep(sweep);
  const { from, to, points } = sweep;
  const log = (sweep.scale ?? "log") === "log";
  const sweepPts: number[] = [];
  for (let k = 0; k < points; k++) {
    const t = k / (points - 1);
    sweepPts.push(k === 0 ? from : k === points - 1 ? to : log ? from * Math.pow(to / from, t) : from + (to - from) * t);
  }
  const edges = bands.flatMap((b) => [b.from, b.to]).sort((a, b) => a - b);
  const kept = sweepPts.filter((f) => !edges.some((e) => Math.abs(f - e) <= EDGE_SNAP * e && f !== e));
  const all = kept.concat(edges).sort((a, b) => a - b);
  const freqs: number[] = [];
  for (const f of all) if (freqs.length === 0 || f !== freqs[freqs.length - 1]) freqs.push(f);
  const grid = Float64Array.from(freqs);
  const ranges = bands.map((b) => ({ start: lowerBound(grid, b.from), end: lowerBound(grid, b.to) + 1 }));
  return { freqs: grid, ranges };
}

/**
 * Checks a sweep spec.
 * @throws EngineError INVALID_INPUT with path "sweep.field"
 */
export function validateSweep(sweep: unknown): SweepSpec {
  const s = sweep as SweepSpec;
  if (typeof s !== "object" || s === null) throw bad("sweep", "`sweep` must be an object { from, to, points, scale }");
  if (s.scale !== undefined && s.scale !== "log" && s.scale !== "lin") throw bad("sweep.scale", '`scale` must be "log" or "lin"');
  const log = (s.scale ?? "log") === "log";
  for (const f of ["from", "to"] as const) {
    if (typeof s[f] !== "number" || !Number.isFinite(s[f]) || s[f] < 0) throw bad(`sweep.${f}`, `\`${f}\` must be a finite frequency ≥ 0 Hz`);
  }
  for (const f of ["from", "to"] as const) {
    if (s[f] > MAX_FREQUENCY_HZ) throw bad(`sweep.${f}`, `\`${f}\` must be at most ${MAX_FREQUENCY_HZ} Hz (1 THz)`);
    if (s[f] > 0 && s[f] < MIN_FREQUENCY_HZ) throw bad(`sweep.${f}`, `\`${f}\` must be 0 or at least ${MIN_FREQUENCY_HZ} Hz (1 mHz)`);
  }
  if (log && !(s.from > 0)) throw bad("sweep.from", "`from` must be > 0 Hz for a log sweep");
  if (!(s.from < s.to)) throw bad("sweep.to", `sweep needs from < to (got from ${s.from} Hz, to ${s.to} Hz)`);
  if (!Number.isInteger(s.points) || s.points < MIN_POINTS || s.points > MAX_POINTS) {
    throw bad("sweep.points", `\`points\` must be an integer ${MIN_POINTS}..${MAX_POINTS}`);
  }
  return s;
}

function lowerBound(a: Float64Array, x: number): number {
  let lo = 0;
  let hi = a.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (a[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function bad(path: string, message: string): EngineError {
  return new EngineError("INVALID_INPUT", message, { path });
}
