/**
 * The Monte Carlo worker pool: piscina threads running workers/trials.worker.ts.
 *
 * A run is split into chunks (default 2500 trials; batches of `batchSize` first when the run stops
 * when sure), the chunks run on the pool in parallel, their aggregates merge exactly and the result
 * is finalized in this thread: the same seed gives the same result whatever the pool size or chunk
 * size. A chunk that fails fails its run with the chunk's EngineError; the pool keeps serving
 * other runs (piscina replaces a crashed thread). Cancellation: an AbortSignal aborts the run's
 * queued and running tasks.
 */
import { setMaxListeners } from "node:events";
import os from "node:os";
import { Piscina } from "piscina";
import { decodeAggregate, type TrialAggregate } from "../../shared/engine/aggregate";
import { EngineError } from "../../shared/engine/errors";
import { driveRun, validateChunkSize, type ChunkTask } from "../../shared/engine/monte-carlo";
import type { Netlist } from "../../shared/engine/netlist";
import type { RunResult } from "../../shared/engine/result";
import type { RunOptions } from "../../shared/engine/run-options";
import { planRun } from "../../shared/engine/run-plan";
import { deserializeEngineError } from "../../shared/engine/task-errors";
import type { TrialsWorkerResult } from "../../workers/trials.worker";

/** Pool settings. */
export interface TrialPoolOptions {
  /** worker threads (default os.availableParallelism()) */
  size?: number;
  /** trials per chunk task (default 2500) */
  chunkSize?: number;
}

/** Per-run controls. */
export interface RunControls {
  signal?: AbortSignal;
  onProgress?: (progress: { done: number; total: number }) => void;
  /** overrides the pool's chunk size for this run */
  chunkSize?: number;
}

/** A pool that runs Monte Carlo analyses. */
export interface TrialPool {
  readonly size: number;
  runMonteCarlo(netlist: Netlist, limits: unknown, options: RunOptions, controls?: RunControls): Promise<RunResult>;
  /** Runs one chunk task on a worker as given (validated there) and returns its aggregate. */
  runChunk(task: ChunkTask, signal?: AbortSignal): Promise<TrialAggregate>;
  close(): Promise<void>;
}

/**
 * Starts a pool.
 * @throws EngineError INVALID_INPUT for a bad size or chunk size
 */
export function createTrialPool(options: TrialPoolOptions = {}): TrialPool {
  const size = options.size ?? os.availableParallelism();
  if (!Number.isInteger(size) || size < 1 || size > 256) throw new EngineError("INVALID_INPUT", "pool `size` must be an integer 1..256", { path: "size" });
  const defaultChunk = validateChunkSize(options.chunkSize);
  const isTs = import.meta.url.endsWith(".ts");
  const needsTsx = isTs && !process.execArgv.some((a) => a.includes("tsx"));
  const piscina = new Piscina({
    filename: new URL(`../../workers/trials.worker.${isTs ? "ts" : "js"}`, import.meta.url).href,
    execArgv: needsTsx ? [...process.execArgv, "--import", "tsx"] : undefined,
    minThreads: size,
    maxThreads: size,
    idleTimeout: 60_000,
  });

  async function runChunk(base: Omit<ChunkTask, "start" | "count">, chunk: { start: number; count: number }, signal?: AbortSignal): Promise<TrialAggregate> {
    let out: TrialsWorkerResult;
    try {
      out = await piscina.run({ ...base, ...chunk }, { signal });
    } catch (err) {
      if (signal?.aborted || (err as Error)?.name === "AbortError") throw new EngineError("CANCELLED", "run cancelled");
      throw err;
    }
    if (out instanceof Uint8Array) return decodeAggregate(out);
    throw deserializeEngineError(out.error);
  }

  return {
    size,
    async runMonteCarlo(netlist, limits, runOptions, controls = {}) {
      // Validate and plan here too: bad input fails fast with its coded error, and finalizing needs the plan.
      const plan = planRun(netlist, limits, runOptions);
      const base = { netlist, limits, options: runOptions };
      const local = new AbortController();
      setMaxListeners(0, local.signal); // one listener per queued chunk task
      const abort = () => local.abort();
      controls.signal?.addEventListener("abort", abort, { once: true });
      if (controls.signal?.aborted) local.abort();
      try {
        return await driveRun(
          plan,
          async (chunks, accept) => {
            // Promise.all rejects on the first failing chunk; the catch below then aborts the rest.
            await Promise.all(chunks.map((c) => runChunk(base, c, local.signal).then(accept)));
          },
          { chunkSize: chunkSizeFor(plan.options, controls.chunkSize ?? defaultChunk, size), onProgress: controls.onProgress, cancel: local.signal },
        );
      } catch (err) {
        local.abort(); // drop this run's queued chunks
        if (controls.signal?.aborted && !(err instanceof EngineError && err.code === "CANCELLED")) throw new EngineError("CANCELLED", "run cancelled");
        throw err;
      } finally {
        controls.signal?.removeEventListener("abort", abort);
      }
    },
    runChunk: (task, signal) => runChunk(task, { start: task.start, count: task.count }, signal),
    close: () => piscina.destroy(),
  };
}

/**
 * Chunk size for a run: in stop-when-sure mode a batch is split across every thread
 * (≤ ⌈batchSize/size⌉ trials per chunk); chunking never changes the result, only the speed.
 */
function chunkSizeFor(options: { targetHalfWidth: number | null; batchSize: number }, chunkSize: number, size: number): number {
  return options.targetHalfWidth === null ? chunkSize : Math.min(chunkSize, Math.ceil(options.batchSize / size));
}
