/**
 * Worker task: evaluate one chunk of Monte Carlo trials.
 *
 * Input: a ChunkTask (netlist, limits, options, start, count), validated on entry; the worker compiles
 * each run once and reuses the plan for the run's later chunks (createChunkRunner).
 * Output: the chunk's aggregate packed into one Uint8Array (encodeAggregate) and handed over with
 * piscina's `move`, which transfers only a top-level value (a nested move() would arrive as {}).
 * An EngineError comes back as `{ error: { code, message, path, details } }` so the pool can rebuild
 * it (structured cloning would drop the code); any other failure is thrown and rejects the task.
 *
 * Test-only fault hook: LOTWISE_TEST_WORKER_FAULT="exit:SEED:START" (or "throw:SEED:START"; several
 * separated by commas) makes the chunk of a run with that seed whose first trial is ≥ START exit the
 * thread (process.exit(7)) or throw a plain Error. It is read from the server's environment (never from
 * a request) and ignored when NODE_ENV is production; tests/integration/faults-worker.test.ts uses it.
 */
import { move } from "piscina";
import { encodeAggregate } from "../shared/engine/aggregate";
import { isEngineError } from "../shared/engine/errors";
import { createChunkRunner, type ChunkTask } from "../shared/engine/monte-carlo";
import { serializeEngineError, type SerializedEngineError } from "../shared/engine/task-errors";

const runChunk = createChunkRunner(4);
const faults = parseFaults(process.env.NODE_ENV === "production" ? undefined : process.env.LOTWISE_TEST_WORKER_FAULT);

function parseFaults(raw: string | undefined): { kind: "exit" | "throw"; seed: string; start: number }[] {
  return (raw ?? "").split(",").flatMap((spec) => {
    const m = /^(exit|throw):([^:]+):(\d+)$/.exec(spec.trim());
    return m ? [{ kind: m[1] as "exit" | "throw", seed: m[2], start: Number(m[3]) }] : [];
  });
}

/** What the pool receives from a chunk task. */
export type TrialsWorkerResult = Uint8Array | { error: SerializedEngineError };

/**
 * Runs one chunk.
 * @param task the chunk task
 * @returns the packed aggregate (moved) or the coded error
 */
export default async function runTrialsTask(task: ChunkTask): Promise<TrialsWorkerResult> {
  const fault = faults.find((f) => String(task.options?.seed) === f.seed && task.start >= f.start);
  if (fault?.kind === "exit") process.exit(7);
  if (fault) throw new Error(`test fault: worker failed at trial ${task.start}`);
  try {
    return move(encodeAggregate(runChunk(task))) as unknown as Uint8Array;
  } catch (err) {
    if (isEngineError(err)) return { error: serializeEngineError(err) };
    throw err;
  }
}
