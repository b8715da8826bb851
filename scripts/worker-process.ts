/**
 * Child processes the tests and the bench both start: a distributed-mode worker (workers/queue-worker.ts) with short
 * locks, and a free loopback port for it or for Redis. Kept outside tests/ so scripts/bench.ts can use it.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { createServer } from "node:net";

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** Polls `probe` every 50 ms until it gives something truthy; throws naming `what` after `ms`. */
export async function until<T>(what: string, probe: () => Promise<T | null | undefined | false> | T | null | undefined | false, ms = 30_000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = await Promise.resolve()
      .then(probe)
      .catch(() => null);
    if (v) return v;
    if (Date.now() > end) throw new Error(`timed out after ${ms} ms waiting for ${what}`);
    await sleep(50);
  }
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

export interface WorkerProcess {
  name: string;
  child: ChildProcess;
  /** everything it printed so far */
  output(): string;
  /** job ids of the chunks it finished (from its chunk_done log lines) */
  chunksDone(): string[];
  /** resolves when it has exited */
  exited: Promise<void>;
  /** SIGKILL (no clean-up of any kind) and wait for the exit */
  kill(): Promise<void>;
  /** SIGTERM (finishes running chunks) and wait */
  stop(): Promise<void>;
}

/**
 * Starts one worker process on `redisUrl` with `threads` trial threads (default 1), short locks (4 s, renewed every 2 s,
 * stalled check every 0.5 s) so a killed worker's chunk comes back within seconds. `netns` runs it inside that network namespace.
 * Resolves once it has logged worker_ready.
 */
export async function startWorker(
  redisUrl: string,
  name: string,
  options: { threads?: number; env?: Record<string, string>; netns?: string } = {},
): Promise<WorkerProcess> {
  const args = ["--import", "tsx", "workers/queue-worker.ts"];
  const env = {
    ...process.env,
    NODE_ENV: "test",
    LOTWISE_REDIS_URL: redisUrl,
    LOTWISE_WORKER_NAME: name,
    LOTWISE_WORKER_THREADS: String(options.threads ?? 1),
    LOTWISE_CHUNK_LOCK_MS: "4000",
    LOTWISE_STALLED_CHECK_MS: "500",
    LOTWISE_LOG_LEVEL: "info",
    ...options.env,
  };
  const child = options.netns
    ? spawn("ip", ["netns", "exec", options.netns, process.execPath, ...args], { env, stdio: ["ignore", "pipe", "pipe"] })
    : spawn(process.execPath, args, { env, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  const gone = () => child.exitCode !== null || child.signalCode !== null;
  await until(
    `worker ${name} to be ready`,
    () => {
      if (gone()) throw new Error(`worker ${name} exited: ${out}`);
      return out.includes('"worker_ready"');
    },
    30_000,
  ).catch((err: Error) => {
    child.kill("SIGKILL");
    throw new Error(`${err.message}\n${out}`);
  });
  return {
    name,
    child,
    output: () => out,
    chunksDone: () => [...out.matchAll(/"event":"chunk_done","worker":"[^"]*","jobId":"([^"]+)"/g)].map((m) => m[1]),
    exited,
    async kill() {
      if (!gone()) child.kill("SIGKILL");
      await exited;
    },
    async stop() {
      if (!gone()) child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), 15_000);
      await exited;
      clearTimeout(timer);
    },
  };
}
