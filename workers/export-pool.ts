/**
 * The export thread(s): replays and exports of stored runs (trial page, trials CSV, Touchstone files) are computed
 * here, in a piscina pool of their own (LOTWISE_EXPORT_THREADS, default 1), never on the thread that answers
 * requests, and in both dispatch modes (distributed mode has no trial pool in the server). Requests share the
 * threads through a fair gate (fair-gate.ts): a quick replay is not queued behind a long CSV export, which is
 * computed in slices. Every task runs under its request's AbortSignal: the client leaving or the export's time
 * budget running out aborts it, and piscina ends a running task by replacing its thread.
 */
import { Piscina } from "piscina";
import { deserializeEngineError } from "../shared/engine/task-errors";
import type { ExportResult, ExportTask } from "./exports.worker";
import type { Logger } from "../server/logger";
import { createFairGate } from "./fair-gate";

export interface ExportPool {
  /** Runs one export task for request `key` (cost: its estimated part evaluations). Rejects with the signal's reason when aborted. */
  run<T>(key: string, cost: number, task: ExportTask, signal: AbortSignal): Promise<T>;
  forget(key: string): void;
  close(): Promise<void>;
}

export function createExportPool(options: { threads?: number; log?: Logger; /** start the threads now and keep them (the server: a thread's start holds the event loop ~0.1 s, which a request should not wait behind) */ eager?: boolean } = {}): ExportPool {
  const threads = options.threads ?? 1;
  const isTs = import.meta.url.endsWith(".ts");
  const needsTsx = isTs && !process.execArgv.some((a) => a.includes("tsx"));
  const piscina = new Piscina({
    filename: new URL(`./exports.worker.${isTs ? "ts" : "js"}`, import.meta.url).href,
    execArgv: needsTsx ? [...process.execArgv, "--import", "tsx"] : undefined,
    minThreads: options.eager ? threads : 0,
    maxThreads: threads,
    idleTimeout: 30_000, // threads above minThreads only
  });
  // An aborted running task ends its thread; piscina's 'error' events for such strays must not stop the server.
  piscina.on("error", (err: Error) => options.log?.warn("export_pool_stray_error", { message: String(err?.message ?? err).slice(0, 300) }));
  const gate = createFairGate(threads);
  return {
    async run<T>(key: string, cost: number, task: ExportTask, signal: AbortSignal): Promise<T> {
      const release = await gate.acquire(key, cost, signal);
      try {
        const out = (await piscina.run(task, { signal })) as ExportResult;
        if ("error" in out) throw deserializeEngineError(out.error);
        return out.ok as T;
      } catch (err) {
        if (signal.aborted) throw signal.reason ?? err;
        throw err;
      } finally {
        release();
      }
    },
    forget: (key) => gate.forget(key),
    close: () => piscina.destroy(),
  };
}
