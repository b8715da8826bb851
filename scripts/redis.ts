import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, rmSync } from "node:fs";
import { resolve } from "node:path";

/** A private redis-server started by Lotwise's scripts (distributed mode, its tests and the benchmark). */
export interface RedisServer {
  port: number;
  /** redis://host:port/ */
  url: string;
  dir: string;
  /** Asks the server to stop (SIGTERM: Redis flushes its append-only file first) and waits until it has. */
  stop(): Promise<void>;
  /** Kills it at once (SIGKILL: whatever the append-only file had not flushed is lost). */
  kill(): Promise<void>;
  /** The process id, or null when it is not running. */
  pid(): number | null;
}

const bin = (name: string) => (existsSync(`/usr/bin/${name}`) ? `/usr/bin/${name}` : name);

/**
 * Starts redis-server with its data in `dir` (created if missing), on `port`, bound to `bind` (default loopback only:
 * nothing else on the network reaches it unless a host address is added). Persistence is the append-only file,
 * fsync'd every second, so jobs survive a restart; no RDB snapshots. Protected mode stays on: with no password set,
 * Redis answers only on loopback. `extraBind` adds addresses (the tests add a veth address of their own network
 * namespace); protected mode is then off, as those addresses belong to a test network only this machine has.
 * `password` sets `requirepass` (`npm run redis` sets one whenever it binds beyond loopback).
 * Resolves once the server answers PING.
 * @throws Error with the end of Redis's log when it does not start within 20 s
 */
export async function startRedis(options: { dir: string; port: number; extraBind?: string[]; password?: string }): Promise<RedisServer> {
  const dir = resolve(options.dir);
  mkdirSync(dir, { recursive: true });
  const pidFile = `${dir}/redis.pid`;
  const logFile = `${dir}/redis.log`;
  const bind = ["127.0.0.1", ...(options.extraBind ?? [])];
  const stale = readPid(pidFile);
  if (stale && isRedis(stale)) {
    // An earlier start on this folder still runs: stop it, so the settings below apply.
    process.kill(stale, "SIGTERM");
    await waitGone(stale, 10_000);
  }
  rmSync(pidFile, { force: true });
  const child: ChildProcess = spawn(bin("redis-server"), [
    "--port", String(options.port), "--bind", ...bind, "--dir", dir, "--pidfile", pidFile, "--logfile", logFile,
    "--daemonize", "no", "--appendonly", "yes", "--appendfsync", "everysec", "--save", "",
    "--protected-mode", options.extraBind?.length ? "no" : "yes", "--maxmemory-policy", "noeviction",
    ...(options.password ? ["--requirepass", options.password] : []),
  ], { detached: true, stdio: "ignore" });
  child.unref();
  let exited = false;
  child.once("exit", () => (exited = true));
  const ping = () =>
    spawnSync(bin("redis-cli"), ["-h", "127.0.0.1", "-p", String(options.port), "--no-auth-warning", ...(options.password ? ["-a", options.password] : []), "ping"], { encoding: "utf8" }).stdout?.trim() === "PONG";
  const deadline = Date.now() + 20_000;
  while (!ping()) {
    if (exited || Date.now() > deadline) {
      const tail = existsSync(logFile) ? readFileSync(logFile, "utf8").split("\n").slice(-15).join("\n") : "";
      throw new Error(`redis-server did not start on port ${options.port}${exited ? " (it exited)" : ""}. Its log ends:\n${tail}`);
    }
    await sleep(100);
  }
  const pid = () => {
    const p = readPid(pidFile) ?? child.pid ?? null;
    return p && isRedis(p) ? p : null;
  };
  const end = async (signal: NodeJS.Signals) => {
    const p = pid();
    if (!p) return;
    process.kill(p, signal);
    await waitGone(p, 20_000);
    if (isRedis(p)) process.kill(p, "SIGKILL");
  };
  return { port: options.port, url: `redis://127.0.0.1:${options.port}/`, dir, pid, stop: () => end("SIGTERM"), kill: () => end("SIGKILL") };
}

/** True when `redis-server` can be found (Debian's package installs /usr/bin/redis-server). */
export function haveRedis(): boolean {
  return existsSync("/usr/bin/redis-server") || spawnSync("sh", ["-c", "command -v redis-server"], { stdio: "ignore" }).status === 0;
}

function readPid(file: string): number | null {
  if (!existsSync(file)) return null;
  const pid = Number.parseInt(readFileSync(file, "utf8").trim(), 10);
  return Number.isInteger(pid) && pid > 0 ? pid : null;
}

function isRedis(pid: number): boolean {
  try {
    process.kill(pid, 0);
    const stat = readFileSync(`/proc/${pid}/stat`, "utf8");
    // A zombie (state Z) has exited; only its parent has not reaped it yet.
    if (/\) Z /.test(stat)) return false;
    return readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("redis-server");
  } catch {
    return false;
  }
}

async function waitGone(pid: number, ms: number): Promise<void> {
  const deadline = Date.now() + ms;
  while (isRedis(pid) && Date.now() < deadline) await sleep(50);
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
