/**
 * Rule margins: how far inside (positive) or beyond (negative) its limit a response is, per rule.
 *
 * For a rule over the grid points B of its band, with metric m(f):
 * - `min` limit:  margin_min = min_{f∈B} (m(f) − min)
 * - `max` limit:  margin_max = min_{f∈B} (max − m(f))
 * - both: margin = min(margin_min, margin_max)
 * - `ripple_db`: m is the single number pp = max_B |S21|dB − min_B |S21|dB, margins as above
 *   (so a max rule gives max − pp).
 * Units: dB for `sIJ_db` and `ripple_db` (|S| dB = 10·log10(re² + im²)), ns for `gd_ns`.
 * A unit passes a rule when its margin ≥ 0 (limits are inclusive). Over temperature corners the
 * trial's margin is the worst (smallest) over corners.
 */
import type { CompiledRule } from "./limits";
import type { SweepBuffers } from "./solver";

/** Margins are clamped to ±this value (dB or ns). */
export const MARGIN_CLAMP = 1e9;

/** A rule bound to the grid: its compiled rule and grid index range [start, end). */
export interface BoundRule {
  rule: CompiledRule;
  start: number;
  end: number;
}

/**
 * Margin of every rule for one evaluated response.
 * @param buffers the solver's output
 * @param rules rules with their grid ranges
 * @param out margins, length rules.length (dB or ns)
 */
export function evaluateMargins(buffers: SweepBuffers, rules: readonly BoundRule[], out: Float64Array): void {
  const db = new Float64Array(buffers.portCount * buffers.portCount * buffers.freqs.length);
  fillMagnitudeDb(buffers, db);
  evaluateMarginsDb(db, buffers, rules, out);
}

/**
 * |S_ij| dB of every pair at every grid point: db[(i·P + j)·F + f] (no allocation).
 * @param buffers the solver's output
 * @param db out, length P²·F
 */
export function fillMagnitudeDb(buffers: SweepBuffers, db: Float64Array): void {
  const P = buffers.portCount;
  const F = buffers.freqs.length;
  const s = buffers.s;
  for (let i = 0; i < P; i++) {
    const kii = (i * P + i) * F;
    for (let f = 0; f < F; f++) db[kii + f] = magDb(s, ((f * P + i) * P + i) * 2);
    for (let j = i + 1; j < P; j++) {
      // The log is the costly part of a Monte Carlo trial. A reciprocal network has S_ji = S_ij, and
      // the solver writes both from the same numbers, so |S_ji| dB is copied when the two entries are
      // equal (then the logs would be equal too); anything else is computed on its own.
      const kij = (i * P + j) * F, kji = (j * P + i) * F;
      for (let f = 0; f < F; f++) {
        const a = ((f * P + i) * P + j) * 2, b = ((f * P + j) * P + i) * 2;
        const v = magDb(s, a);
        db[kij + f] = v;
        db[kji + f] = s[a] === s[b] && s[a + 1] === s[b + 1] ? v : magDb(s, b);
      }
    }
  }
}

/**
 * Margins from precomputed |S| dB (fillMagnitudeDb) and the solver's group delay (no allocation).
 * @param db |S_ij| dB, index (i·P + j)·F + f
 * @param buffers the solver's output (for group delay and sizes)
 * @param rules rules with their grid ranges
 * @param out margins, length rules.length
 */
export function evaluateMarginsDb(db: Float64Array, buffers: SweepBuffers, rules: readonly BoundRule[], out: Float64Array): void {
  const P = buffers.portCount;
  const F = buffers.freqs.length;
  const gd = buffers.gd;
  for (let r = 0; r < rules.length; r++) {
    const { rule, start, end } = rules[r];
    const { i, j } = rule.parsed;
    const base = (i * P + j) * F;
    const lo = rule.min;
    const hi = rule.max;
    let margin = Infinity;
    if (rule.parsed.kind === "ripple_db") {
      let top = -Infinity;
      let bottom = Infinity;
      for (let f = start; f < end; f++) {
        const v = db[base + f];
        if (v > top) top = v;
        if (v < bottom) bottom = v;
      }
      const pp = top - bottom;
      if (lo !== undefined) margin = pp - lo;
      if (hi !== undefined) margin = Math.min(margin, hi - pp);
    } else {
      const isGd = rule.parsed.kind === "gd_ns";
      for (let f = start; f < end; f++) {
        const m = isGd ? gd[(f * P + i) * P + j] * 1e9 : db[base + f];
        if (lo !== undefined && m - lo < margin) margin = m - lo;
        if (hi !== undefined && hi - m < margin) margin = hi - m;
      }
    }
    // A NaN metric (never expected from the solver) must fail, not pass silently; margins are
    // clamped to ±1e9 so that |S| = 0 (−∞ dB) keeps the statistics finite.
    out[r] = Number.isNaN(margin) ? -MARGIN_CLAMP : Math.max(-MARGIN_CLAMP, Math.min(MARGIN_CLAMP, margin));
  }
}

/** |S| in dB at interleaved offset o: 10·log10(re² + im²). */
export function magDb(s: Float64Array, o: number): number {
  const re = s[o];
  const im = s[o + 1];
  return 10 * Math.log10(re * re + im * im);
}
