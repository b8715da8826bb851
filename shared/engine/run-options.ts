/**
 * Options of a Monte Carlo run and their validation (guard checks; zod lives at the edges in
 * shared/schemas/run.ts).
 */
import { EngineError } from "./errors";
import type { SweepSpec } from "./frequency-grid";
import type { CompiledRule } from "./limits";
import { validateSeed, type RunSeed } from "./random";

/** Most trials a run may ask for. */
export const MAX_TRIALS = 100_000_000;
/** Most temperature corners. */
export const MAX_CORNERS = 10;
/** Default sweep points when the sweep is taken from the rules. */
export const DEFAULT_POINTS = 201;

/** What a run request may set. */
export interface RunOptions {
  /** number of trials, or the trial cap when `targetHalfWidth` is set (1..1e8) */
  trials: number;
  /** run seed: integer 0..2^31−1 or a string */
  seed: RunSeed;
  /** sweep grid; default: log, 201 points from the lowest rule `from` to the highest rule `to` */
  sweep?: SweepSpec;
  /** temperature corners in °C (default [25]); a trial passes only if it passes at every corner */
  corners?: number[];
  /** correlation between parts of one lot (default 0.9), see sampling.ts */
  lotCorrelation?: number;
  /** tolerance = kσ for normal parts (default 3) */
  toleranceSigmas?: number;
  /** stop when the Wilson 95 % half-width ≤ this (0 < t < 0.5); unset = run all `trials` */
  targetHalfWidth?: number;
  /** batch size for stop-when-sure (default 1000) */
  batchSize?: number;
  /** envelope histogram bin width in dB (default 0.02) */
  envelopeBinDb?: number;
  /** envelope window half-span around the nominal in dB (default 6) */
  envelopeSpanDb?: number;
  /** margin histogram bins per rule (default 60) */
  histogramBins?: number;
  /** trials (by index, from 0) kept for the rank-correlation sensitivity (default 5000) */
  sensitivitySampleSize?: number;
  /** how many first failing trial indices to keep (default 20) */
  failingTrialCount?: number;
}

/** Options with every default filled in. */
export interface ResolvedRunOptions {
  trials: number;
  seed: RunSeed;
  sweep: SweepSpec;
  corners: number[];
  lotCorrelation: number;
  toleranceSigmas: number;
  targetHalfWidth: number | null;
  batchSize: number;
  envelopeBinDb: number;
  envelopeSpanDb: number;
  histogramBins: number;
  sensitivitySampleSize: number;
  failingTrialCount: number;
}

/**
 * Checks run options and fills in the defaults.
 * @param options untrusted options
 * @param rules the run's validated rules (for the default sweep)
 * @throws EngineError INVALID_INPUT naming the option
 */
export function resolveRunOptions(options: unknown, rules: readonly CompiledRule[]): ResolvedRunOptions {
  if (typeof options !== "object" || options === null) throw bad("options", "run options must be an object");
  const o = options as RunOptions;
  const trials = int(o.trials, "trials", 1, MAX_TRIALS);
  const seed = validateSeed(o.seed);
  const corners = o.corners ?? [25];
  if (!Array.isArray(corners) || corners.length < 1 || corners.length > MAX_CORNERS) throw bad("corners", `\`corners\` must list 1..${MAX_CORNERS} temperatures in °C`);
  corners.forEach((c, k) => {
    if (typeof c !== "number" || !Number.isFinite(c) || c < -273.15 || c > 500) throw bad(`corners[${k}]`, "each corner must be a temperature in °C between −273.15 and 500");
  });
  let sweep = o.sweep;
  if (sweep === undefined) {
    if (rules.length === 0) throw bad("sweep", "`sweep` is required when the limits have no rules");
    sweep = { from: Math.min(...rules.map((r) => r.from)), to: Math.max(...rules.map((r) => r.to)), points: DEFAULT_POINTS, scale: "log" };
  }
  const target = o.targetHalfWidth;
  if (target !== undefined && target !== null && (typeof target !== "number" || !(target > 0 && target < 0.5))) {
    throw bad("targetHalfWidth", "`targetHalfWidth` must be a number between 0 and 0.5");
  }
  return {
    trials, seed, sweep, corners: corners.slice(),
    lotCorrelation: num(o.lotCorrelation, 0.9, "lotCorrelation", 0, 1),
    toleranceSigmas: num(o.toleranceSigmas, 3, "toleranceSigmas", 1, 6),
    targetHalfWidth: target ?? null,
    batchSize: o.batchSize === undefined ? 1000 : int(o.batchSize, "batchSize", 1, 1_000_000),
    envelopeBinDb: num(o.envelopeBinDb, 0.02, "envelopeBinDb", 0.001, 1),
    envelopeSpanDb: num(o.envelopeSpanDb, 6, "envelopeSpanDb", 0.1, 100),
    histogramBins: o.histogramBins === undefined ? 60 : int(o.histogramBins, "histogramBins", 2, 1000),
    sensitivitySampleSize: o.sensitivitySampleSize === undefined ? 5000 : int(o.sensitivitySampleSize, "sensitivitySampleSize", 0, 100_000),
    failingTrialCount: o.failingTrialCount === undefined ? 20 : int(o.failingTrialCount, "failingTrialCount", 0, 1000),
  };
}

function int(v: unknown, name: string, lo: number, hi: number): number {
  if (typeof v !== "number" || !Number.isInteger(v) || v < lo || v > hi) throw bad(name, `\`${name}\` must be an integer ${lo}..${hi}`);
  return v;
}

function num(v: unknown, dflt: number, name: string, lo: number, hi: number): number {
  if (v === undefined) return dflt;
  if (typeof v !== "number" || !(v >= lo && v <= hi)) throw bad(name, `\`${name}\` must be a number between ${lo} and ${hi}`);
  return v;
}

function bad(path: string, message: string): EngineError {
  return new EngineError("INVALID_INPUT", message, { path });
}
