/**
 * Worker task: evaluate one chunk of Monte Carlo trials.
 *
 * Input: a ChunkTask (netlist, limits, options, start, count), validated on entry; the worker compiles
 * each run once and reuses the plan for the run's later chunks (createChunkRunner).
 * Output: the chunk's aggregate packed into one Uint8Array (encodeAggregate) and handed over with
 * piscina's `move`, which transfers only a top-level value (a nested move() would arrive as {}).
 * An EngineError comes back as `{ error: { code, message, path, details } }` so the pool can rebuild
 * it (structured cloning would drop the code); any other failure is thrown and rejects the task.
 */
import { move } from "piscina";
import { encodeAggregate } from "../shared/engine/aggregate";
import { isEngineError } from "../shared/engine/errors";
import { createChunkRunner, type ChunkTask } from "../shared/engine/monte-carlo";
import { serializeEngineError, type SerializedEngineError } from "../shared/engine/task-errors";

const runChunk = createChunkRunner(4);

/** What the pool receives from a chunk task. */
export type TrialsWorkerResult = Uint8Array | { error: SerializedEngineError };

/**
 * Runs one chunk.
 * @param task the chunk task
 * @returns the packed aggregate (moved) or the coded error
 */
export default async function runTrialsTask(task: ChunkTask): Promise<TrialsWorkerResult> {
  try {
    return move(encodeAggregate(runChunk(task))) as unknown as Uint8Array;
  } catch (err) {
    if (isEngineError(err)) return { error: serializeEngineError(err) };
    throw err;
  }
}
