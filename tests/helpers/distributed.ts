/**
 * Distributed-mode test parts: a private redis-server per test file and real worker processes
 * (`node --import tsx workers/queue-worker.ts`, what `npm run worker` runs, started by scripts/worker-process.ts,
 * which the bench shares), optionally inside a network namespace.
 */
import { rmSync } from "node:fs";
import { startRedis, type RedisServer } from "../../scripts/redis";
import type { DataSource } from "typeorm";
import type { Logger } from "../../server/logger";
import { freePort } from "../../scripts/worker-process";

export { freePort, sleep, startWorker, until, type WorkerProcess } from "../../scripts/worker-process";

/** A redis-server of this test file's own: free port, fresh data folder under .tmp (removed by stop). */
export async function startTestRedis(tag: string, options: { extraBind?: string[] } = {}): Promise<RedisServer & { restart(o?: { fresh?: boolean }): Promise<void>; cleanUp(): Promise<void> }> {
  const port = await freePort();
  let dir = `.tmp/redis-${tag}-${process.pid}`;
  rmSync(dir, { recursive: true, force: true });
  let current = await startRedis({ dir, port, extraBind: options.extraBind });
  return {
    get port() {
      return current.port;
    },
    get url() {
      return current.url;
    },
    get dir() {
      return current.dir;
    },
    pid: () => current.pid(),
    stop: () => current.stop(),
    kill: () => current.kill(),
    /** Starts it again on the same port: on the same data (jobs survive) or, with `fresh`, on an empty folder. */
    async restart(o = {}) {
      if (o.fresh) {
        rmSync(dir, { recursive: true, force: true });
        dir = `${dir}-fresh`;
        rmSync(dir, { recursive: true, force: true });
      }
      current = await startRedis({ dir, port, extraBind: options.extraBind });
    },
    async cleanUp() {
      await current.kill();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** A run's stored result as MariaDB returns it (text), for byte-for-byte comparisons. */
export async function storedResultText(ds: DataSource, runId: string): Promise<string> {
  const rows = (await ds.query("SELECT result FROM run_result WHERE run_id = ?", [runId])) as { result: unknown }[];
  if (rows.length !== 1) throw new Error(`run ${runId} has ${rows.length} stored results`);
  return typeof rows[0].result === "string" ? rows[0].result : JSON.stringify(rows[0].result);
}

/** A logger that keeps every line (event and fields) for assertions. */
export function recordingLogger(): Logger & { lines: { level: string; event: string; fields?: Record<string, unknown> }[] } {
  const lines: { level: string; event: string; fields?: Record<string, unknown> }[] = [];
  return {
    lines,
    info: (event, fields) => void lines.push({ level: "info", event, fields }),
    warn: (event, fields) => void lines.push({ level: "warn", event, fields }),
    error: (event, fields) => void lines.push({ level: "error", event, fields }),
  };
}
