/** Removing a finished, failed or cancelled batch (parent and chunk jobs) from Redis, retried while parts of it still run. */
import type { Queue } from "bullmq";
import type { ChunkJobData, ChunkJobResult } from "./chunk-jobs";
import { within } from "./redis-bounds";

export interface BatchRemoverDeps {
  chunks: Queue<ChunkJobData, ChunkJobResult>;
  batches: Queue;
  /** bound of one look at Redis (ms) */
  passTimeoutMs: number;
  isClosed(): boolean;
}

export function createBatchRemover(deps: BatchRemoverDeps) {
  const removals = new Set<Promise<void>>();
  function remove(parentId: string, ids: string[]): void {
    const p = removeBatch(parentId, ids, 0).finally(() => removals.delete(p));
    removals.add(p);
  }

  /**
   * Removes a batch from Redis once nothing of it is running: its chunks, then the parent. A chunk still running
   * (after a cancel or a failure) cannot be removed yet, nor anything while Redis is away, so what is left is tried
   * again up to 10 times, 2 s apart doubling to 1 min (about 6 min in all). Chunks still left then are dropped by
   * BullMQ a day after they finished, parents by the hourly sweep.
   */
  async function removeBatch(parentId: string, ids: string[], attempt: number): Promise<void> {
    const left: string[] = [];
    const never = new AbortController().signal;
    try {
      for (const id of ids) {
        const ok = await within(deps.chunks.getJob(id).then((j) => j?.remove()), deps.passTimeoutMs, never).then(() => true, () => false);
        if (!ok) left.push(id);
      }
      await within(deps.batches.getJob(parentId).then((p) => p?.remove()), deps.passTimeoutMs, never);
    } catch {
      left.push("");
    }
    if (left.length > 0 && attempt < 10 && !deps.isClosed()) setTimeout(() => void removeBatch(parentId, left.filter(Boolean), attempt + 1), Math.min(2000 * 2 ** attempt, 60_000)).unref();
  }

  return {
    remove,
    /** The removals still going on (close() lets them end, bounded). */
    pending: () => [...removals],
  };
}
