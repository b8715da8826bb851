/**
 * Seeded Monte Carlo yield runs.
 *
 * A run = netlist + limits + options (trials, seed, sweep, corners, …). Trial i samples part values
 * from its own stream (random.ts, sampling.ts), is solved at every grid point at every temperature
 * corner, and its margin per rule is the worst over corners (rules.ts); it passes when every margin
 * is ≥ 0. Chunks of trials produce mergeable aggregates (aggregate.ts), merged exactly and finalized
 * into a RunResult (result.ts). `runMonteCarlo` drives a run in one thread (browser, CLI with one
 * worker, tests); workers/trial-pool.ts drives the same chunks on a worker pool.
 *
 * Stop when sure: with `targetHalfWidth`, trials run in batches of `batchSize` (default 1000); after
 * each batch the Wilson 95 % half-width of all trials so far is checked and the run stops once it is
 * ≤ the target or the trial cap `trials` is reached. The check only sees merged counts after whole
 * batches, so the stopping point depends on the seed alone, not on workers or chunking.
 */
import { createAggregate, emptyAggregateLike, mergeInto, type SampleSegment, type TrialAggregate } from "./aggregate";
import { EngineError } from "./errors";
import type { Netlist } from "./netlist";
import { createTrialStream, type RunSeed } from "./random";
import { finalizeRun, type RunResult } from "./result";
import type { RunOptions } from "./run-options";
import { planRun, trialCost, type RunPlan, type RunShape } from "./run-plan";
import { evaluateMargins, evaluateMarginsDb, fillMagnitudeDb, magDb } from "./rules";
import { sampleTrial } from "./sampling";
import { sParamDeg } from "./solver";
import { exactSumAdd, exactSumCanonicalize } from "./stats/exact-sum";
import { histogramSlot } from "./stats/histogram";
import { wilsonHalfWidth } from "./stats/intervals";

/** A cancellation flag checked between trials (an AbortSignal satisfies it). */
export interface CancelFlag {
  readonly aborted: boolean;
}

/** One chunk of a run: trials [start, start + count). */
export interface ChunkTask {
  netlist: Netlist;
  limits: unknown;
  options: RunOptions;
  start: number;
  count: number;
}

/**
 * Evaluates trials [start, start + count) of a run and returns their aggregate (no per-trial data
 * except the sensitivity sample of trials with index < sensitivitySampleSize).
 * @param task the chunk (validated on entry)
 * @param cancel optional flag; when it turns true the chunk stops with EngineError CANCELLED
 * @throws EngineError INVALID_INPUT / INVALID_NETLIST / INVALID_LIMITS, SINGULAR_MATRIX, CANCELLED
 */
export function runTrialChunk(task: ChunkTask, cancel?: CancelFlag): TrialAggregate {
  if (typeof task !== "object" || task === null) throw new EngineError("INVALID_INPUT", "chunk task must be an object", { path: "task" });
  const plan = planRun(task.netlist, task.limits, task.options);
  checkChunkRange(task, plan.options.trials);
  return evaluateTrials(plan, task.start, task.count, cancel);
}

function checkChunkRange(task: ChunkTask, trials: number): void {
  const { start, count } = task;
  if (!Number.isInteger(start) || start < 0) throw new EngineError("INVALID_INPUT", "`start` must be an integer ≥ 0", { path: "start" });
  if (!Number.isInteger(count) || count < 1 || start + count > trials) {
    throw new EngineError("INVALID_INPUT", "`count` must be an integer ≥ 1 with start + count ≤ trials", { path: "count" });
  }
}

/**
 * A chunk runner that compiles each run once: it keeps the plans of the last few runs (keyed by the
 * run's netlist, limits and options), so the chunks of one run on one worker share the compiled
 * netlist and sweep buffers. Not re-entrant (one chunk at a time, as in a worker thread).
 * @param capacity runs kept (default 4)
 */
export function createChunkRunner(capacity = 4): (task: ChunkTask, cancel?: CancelFlag) => TrialAggregate {
  const plans = new Map<string, RunPlan>();
  return (task, cancel) => {
    if (typeof task !== "object" || task === null) throw new EngineError("INVALID_INPUT", "chunk task must be an object", { path: "task" });
    const key = JSON.stringify([task.netlist, task.limits, task.options]);
    let plan = plans.get(key);
    if (plan === undefined) {
      plan = planRun(task.netlist, task.limits, task.options);
      plans.set(key, plan);
      if (plans.size > capacity) plans.delete(plans.keys().next().value as string);
    }
    checkChunkRange(task, plan.options.trials);
    return evaluateTrials(plan, task.start, task.count, cancel);
  };
}

/** The trial loop of a chunk on an already built plan. */
export function evaluateTrials(plan: RunPlan, start: number, count: number, cancel?: CancelFlag): TrialAggregate {
  const agg = createAggregate(plan);
  const P = plan.sampling.partCount;
  const R = plan.rules.length;
  const F = plan.grid.freqs.length;
  const { seed, corners, histogramBins, sensitivitySampleSize, failingTrialCount } = plan.options;
  const values = new Float64Array(P);
  const deviations = new Float64Array(P);
  const lots = new Float64Array(plan.sampling.lotNames.length);
  const worst = new Float64Array(R);
  const margins = new Float64Array(R);
  const envBins = plan.envelopeBins;
  const envStride = envBins + 2;
  const envInv = 1 / plan.envelopeBinDb;
  const envLo = plan.nominalDb.map((db) => db - plan.options.envelopeSpanDb);
  const env = agg.envelopeCounts;
  const cells = plan.pairs.length * F;
  const db = new Float64Array(cells);
  // envMirror[cell of S_ji] = cell of S_ij for i < j (−1 otherwise): its bin is computed first (pairs are i-major).
  const envMirror = new Int32Array(cells).fill(-1);
  const envSlot = new Int32Array(cells);
  plan.pairs.forEach((p, k) => {
    if (p.i <= p.j) return;
    const m = plan.pairs.findIndex((q) => q.i === p.j && q.j === p.i);
    if (m >= 0 && m < k) for (let f = 0; f < F; f++) envMirror[k * F + f] = m * F + f;
  });
  const invW = plan.marginEdges.map((e) => e.bins / (e.hi - e.lo));
  const sampleEnd = Math.min(start + count, sensitivitySampleSize);
  const segment: SampleSegment | null = start < sampleEnd
    ? { start, count: sampleEnd - start, deviations: new Float64Array((sampleEnd - start) * P), margins: new Float64Array((sampleEnd - start) * R) }
    : null;

  for (let t = start; t < start + count; t++) {
    if (cancel?.aborted) throw new EngineError("CANCELLED", `run cancelled at trial ${t}`, { details: { trial: t } });
    sampleTrial(plan.sampling, createTrialStream(seed, t), values, deviations, lots);
    worst.fill(Infinity);
    for (const tempC of corners) {
      const buf = plan.evaluator.evaluate(values, tempC);
      fillMagnitudeDb(buf, db); // one log per pair and point, shared by the rules and the envelopes
      evaluateMarginsDb(db, buf, plan.rules, margins);
      for (let r = 0; r < R; r++) if (margins[r] < worst[r]) worst[r] = margins[r];
      for (let cell = 0; cell < cells; cell++) {
        const mirror = envMirror[cell];
        // S_ji of a reciprocal network: same |S| dB and same window as S_ij, hence the same bin.
        const slot = mirror >= 0 && db[mirror] === db[cell] && envLo[mirror] === envLo[cell]
          ? envSlot[mirror]
          : histogramSlot(envLo[cell], envInv, envBins, db[cell]);
        envSlot[cell] = slot;
        env[cell * envStride + slot]++;
      }
    }
    let pass = true;
    for (let r = 0; r < R; r++) {
      const m = worst[r];
      if (m < 0) {
        pass = false;
        agg.ruleFailures[r]++;
      }
      exactSumAdd(agg.marginSum[r], m);
      exactSumAdd(agg.marginSumSq[r], m * m);
      if (m < agg.marginMin[r]) agg.marginMin[r] = m;
      if (m > agg.marginMax[r]) agg.marginMax[r] = m;
      const e = plan.marginEdges[r];
      agg.marginCounts[r * (histogramBins + 2) + histogramSlot(e.lo, invW[r], e.bins, m)]++;
    }
    if (pass) agg.passed++;
    else if (agg.failing.length < failingTrialCount) agg.failing.push(t);
    if (segment && t < sampleEnd) {
      segment.deviations.set(deviations, (t - start) * P);
      segment.margins.set(worst, (t - start) * R);
    }
  }
  for (let r = 0; r < R; r++) {
    exactSumCanonicalize(agg.marginSum[r]);
    exactSumCanonicalize(agg.marginSumSq[r]);
  }
  agg.trials = count;
  agg.ranges = [[start, start + count]];
  if (segment) agg.sample = [segment];
  return agg;
}

/** How a run is split: `chunkSize` trials per chunk (default 2500). */
export interface DriveOptions {
  chunkSize?: number;
  onProgress?: (progress: { done: number; total: number }) => void;
  cancel?: CancelFlag;
}

/**
 * The chunk schedule of a run: batches (stop-when-sure) of chunks [start, count).
 * Without a target the whole run is one batch.
 */
export function planBatches(trials: number, targetHalfWidth: number | null, batchSize: number, chunkSize: number): { start: number; count: number }[][] {
  const batches: { start: number; count: number }[][] = [];
  const step = targetHalfWidth === null ? trials : batchSize;
  for (let b = 0; b < trials; b += step) {
    const end = Math.min(trials, b + step);
    const chunks: { start: number; count: number }[] = [];
    for (let c = b; c < end; c += chunkSize) chunks.push({ start: c, count: Math.min(chunkSize, end - c) });
    batches.push(chunks);
  }
  return batches;
}

/**
 * Runs batches of chunks with any chunk executor (in-thread or a worker pool) and finalizes.
 * Chunk aggregates are merged as they arrive (any order: the merge is exact), so memory holds one
 * running total plus the chunks in flight, whatever the trial count.
 * @param plan the run plan (for the empty aggregate and options)
 * @param runChunks executes the chunks of one batch, passing each aggregate to `accept`
 */
export async function driveRun(
  run: RunPlan | RunShape,
  runChunks: (chunks: { start: number; count: number }[], accept: (agg: TrialAggregate) => void) => Promise<void>,
  drive: DriveOptions = {},
): Promise<RunResult> {
  const { trials, targetHalfWidth, batchSize } = run.options;
  const chunkSize = validateChunkSize(drive.chunkSize);
  // With a plan the total starts empty; with a shape only (a pool's driver, which leaves planning to the workers) it
  // starts as an empty copy of the first chunk's aggregate: the same merges either way, hence the same result.
  let total: TrialAggregate | null = "evaluator" in run ? createAggregate(run) : null;
  for (const batch of planBatches(trials, targetHalfWidth, batchSize, chunkSize)) {
    if (drive.cancel?.aborted) throw new EngineError("CANCELLED", `run cancelled after ${total?.trials ?? 0} trials`);
    await runChunks(batch, (part) => {
      total ??= emptyAggregateLike(part);
      mergeInto(total, part);
      drive.onProgress?.({ done: total.trials, total: trials });
    });
    if (targetHalfWidth !== null && total !== null && wilsonHalfWidth(total.passed, total.trials) <= targetHalfWidth) break;
  }
  if (total === null) throw new EngineError("INVALID_INPUT", "a run needs at least one trial", { path: "trials" });
  return finalizeRun(total, { targetHalfWidth });
}

/**
 * Runs a whole Monte Carlo analysis in the calling thread.
 * @param netlist the circuit, @param limits the limit set, @param options trials, seed and the rest
 * @returns the run result
 * @throws EngineError as runTrialChunk
 * @example const res = await runMonteCarlo(netlist, limits, { trials: 10000, seed: 1 }); res.wilson95
 */
export async function runMonteCarlo(netlist: Netlist, limits: unknown, options: RunOptions, drive: DriveOptions = {}): Promise<RunResult> {
  const plan = planRun(netlist, limits, options);
  return driveRun(plan, async (chunks, accept) => {
    for (const c of chunks) accept(evaluateTrials(plan, c.start, c.count, drive.cancel));
  }, drive);
}

/** Default and bounds of the chunk size. */
export const DEFAULT_CHUNK_SIZE = 2500;

/**
 * Most part evaluations (trials × corners × points × parts) in one chunk: 0.1 s of one thread on a small ladder,
 * about a second on the largest circuits (which solve several times slower per part). Chunks of large circuits get
 * fewer trials, down to one, so runs that share a pool take turns at least this often (chunking never changes a
 * result). Equal to the default per-trial limit (shared/schemas/settings.ts).
 */
export const CHUNK_COST_BUDGET = 3e6;

/** The chunk size for a run: `chunkSize`, or fewer trials when a chunk would cost more than CHUNK_COST_BUDGET (at least 1). */
export function costBoundedChunkSize(run: RunShape, chunkSize: number): number {
  return Math.max(1, Math.min(chunkSize, Math.floor(CHUNK_COST_BUDGET / Math.max(1, trialCost(run)))));
}

/** Checks a chunk size (integer 1..1e6), default 2500. @throws EngineError INVALID_INPUT */
export function validateChunkSize(chunkSize: number | undefined): number {
  if (chunkSize === undefined) return DEFAULT_CHUNK_SIZE;
  if (!Number.isInteger(chunkSize) || chunkSize < 1 || chunkSize > 1_000_000) throw new EngineError("INVALID_INPUT", "`chunkSize` must be an integer 1..1000000", { path: "chunkSize" });
  return chunkSize;
}

/** The full response and part values of one replayed trial. */
export interface TrialReplay {
  seed: RunSeed;
  index: number;
  pass: boolean;
  parts: { ref: string; nominal: number; value: number; deviation: number }[];
  /** worst margin per rule over corners */
  margins: number[];
  freqs: number[];
  corners: { tempC: number; margins: number[]; sDb: Record<string, number[]>; sDeg: Record<string, number[]>; gd21Ns: number[] }[];
}

/**
 * Replays trial `index` of a run exactly (the same stream as in the run).
 * @param netlist @param limits @param options run options (trials and seed may be omitted)
 * @param seed the run seed @param index trial index (integer ≥ 0)
 * @throws EngineError as runTrialChunk
 */
export function replayTrial(netlist: Netlist, limits: unknown, options: Partial<RunOptions>, seed: RunSeed, index: number): TrialReplay {
  if (!Number.isInteger(index) || index < 0) throw new EngineError("INVALID_INPUT", "`index` must be an integer ≥ 0", { path: "index" });
  return replayTrialOnPlan(planRun(netlist, limits, { ...options, seed, trials: Math.max(options.trials ?? 1, index + 1) }), index);
}

/**
 * replayTrial on a plan already built for the run (its `trials` must cover `index`): the export thread keeps the plans
 * of recent runs, so browsing a run's trials does not re-solve its nominal response each time.
 * @throws EngineError INVALID_INPUT for an index outside the plan's trials
 */
export function replayTrialOnPlan(plan: RunPlan, index: number): TrialReplay {
  if (!Number.isInteger(index) || index < 0 || index >= plan.options.trials) throw new EngineError("INVALID_INPUT", "`index` must be an integer within the run's trials", { path: "index" });
  const P = plan.sampling.partCount;
  const values = new Float64Array(P);
  const deviations = new Float64Array(P);
  sampleTrial(plan.sampling, createTrialStream(plan.options.seed, index), values, deviations);
  const margins = new Float64Array(plan.rules.length);
  const worst = new Array<number>(plan.rules.length).fill(Infinity);
  const ports = plan.compiled.portCount;
  const corners = plan.options.corners.map((tempC) => {
    const buf = plan.evaluator.evaluate(values, tempC);
    evaluateMargins(buf, plan.rules, margins);
    margins.forEach((m, r) => (worst[r] = Math.min(worst[r], m)));
    const sDb: Record<string, number[]> = {};
    const sDeg: Record<string, number[]> = {};
    for (const p of plan.pairs) {
      sDb[p.name] = Array.from(plan.grid.freqs, (_, f) => magDb(buf.s, ((f * ports + p.i) * ports + p.j) * 2));
      sDeg[p.name.replace("_db", "_deg")] = Array.from(sParamDeg(buf, p.i, p.j));
    }
    const gd21Ns = Array.from(plan.grid.freqs, (_, f) => buf.gd[(f * ports + 1) * ports + 0] * 1e9);
    return { tempC, margins: Array.from(margins), sDb, sDeg, gd21Ns };
  });
  return {
    seed: plan.options.seed,
    index,
    pass: worst.every((m) => m >= 0),
    parts: plan.sampling.refs.map((ref, k) => ({ ref, nominal: plan.sampling.nominal[k], value: values[k], deviation: deviations[k] })),
    margins: worst,
    freqs: Array.from(plan.grid.freqs),
    corners,
  };
}
