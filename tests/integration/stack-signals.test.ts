import { spawn, type ChildProcess } from "node:child_process";
import { existsSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { connect, type Socket } from "node:net";
import { resolve } from "node:path";
import mysql from "mysql2/promise";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { freePort, sleep, until } from "../helpers/distributed";

// `npm start` as a person runs it: the real command, in a process group of its own (as a terminal makes one), on a
// data folder and ports of this file. What it started (MariaDB, the mail stand-in, the server) must be gone after
// Ctrl-C (SIGINT to the whole group) or SIGTERM, within a bound, even with a client still connected, a second
// Ctrl-C, or a signal that arrives while it is still starting; and a second `npm start` on the same data folder must
// fail clearly without stopping the first one's MariaDB. MariaDB is looked for by its data folder in /proc, so one
// left running is found even when its pid file is gone.

const DIR = resolve(`.tmp/stack-signals-${process.pid}`);
const STOP_BOUND_MS = 45_000;
let ports: { app: number; sink: number; db: number };
const stacks: Stack[] = [];

interface Stack {
  child: ChildProcess;
  pgid: number;
  output(): string;
  /** resolves with the exit code (null when ended by a signal) */
  exited: Promise<number | null>;
  done(): boolean;
}

function startStack(): Stack {
  const inherited = Object.fromEntries(Object.entries(process.env).filter(([k]) => !k.startsWith("LOTWISE_") && k !== "NODE_ENV"));
  const env: Record<string, string | undefined> = {
    ...inherited,
    LOTWISE_DATA_DIR: DIR, LOTWISE_DB_PORT: String(ports.db), LOTWISE_PORT: String(ports.app), LOTWISE_MAIL_SINK_PORT: String(ports.sink),
    LOTWISE_HOST: "127.0.0.1", LOTWISE_WORKERS: "1", LOTWISE_LOG_LEVEL: "warn", LOTWISE_SKIP_BUILD: "1",
    // The built client when there is one; the API works without it.
    ...(existsSync("dist/client/index.html") ? {} : { LOTWISE_CLIENT_DIR: ".tmp/no-client" }),
  };
  const child = spawn("npm", ["start"], { cwd: process.cwd(), env, detached: true, stdio: ["ignore", "pipe", "pipe"] });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  let ended = false;
  const exited = new Promise<number | null>((r) => child.once("exit", (code) => ((ended = true), r(code))));
  const stack = { child, pgid: child.pid!, output: () => out, exited, done: () => ended };
  stacks.push(stack);
  return stack;
}

async function serving(stack: Stack): Promise<void> {
  await until("npm start to serve", async () => {
    if (stack.done()) throw new Error(`npm start exited:\n${stack.output()}`);
    return (await fetch(`http://127.0.0.1:${ports.app}/api/health`)).ok && stack.output().includes("Lotwise is running at");
  }, 150_000).catch((err: Error) => {
    throw new Error(`${err.message}\n${stack.output()}`);
  });
}

/** Processes whose command line contains every one of `parts` (from /proc). */
function processesWith(...parts: string[]): number[] {
  const found: number[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const cmd = readFileSync(`/proc/${entry}/cmdline`, "utf8").replace(/\0/g, " ");
      if (parts.every((p) => cmd.includes(p))) found.push(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  return found;
}

/** The MariaDB servers running on this file's data folder (not mariadb-install-db's bootstrap runs). */
const mariadbds = () => processesWith("mariadbd", `--datadir=${DIR}/data`, "--pid-file=");

/** Processes still in the process group `pgid` (npm, its shell, Node). */
function groupMembers(pgid: number): number[] {
  const found: number[] = [];
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      if (Number(fields[2]) === pgid && fields[0] !== "Z") found.push(Number(entry));
    } catch {
      // gone meanwhile
    }
  }
  return found;
}

function listening(port: number): Promise<boolean> {
  return new Promise((r) => {
    const s = connect(port, "127.0.0.1");
    s.once("connect", () => (s.destroy(), r(true)));
    s.once("error", () => r(false));
  });
}

/** Waits until nothing of `stack` is left: its processes, MariaDB on the folder, the three ports, the lock file. */
async function allGone(stack: Stack, since: number): Promise<number> {
  let left = "";
  await until("everything npm start started to be gone", async () => {
    const open = [];
    for (const [name, port] of Object.entries(ports)) if (await listening(port)) open.push(`${name} port ${port}`);
    const parts = [
      ...(groupMembers(stack.pgid).length ? [`processes ${groupMembers(stack.pgid).join(",")} of its group`] : []),
      ...(mariadbds().length ? [`mariadbd ${mariadbds().join(",")}`] : []),
      ...open,
    ];
    left = parts.join(", ");
    return parts.length === 0;
  }, STOP_BOUND_MS).catch((err: Error) => {
    throw new Error(`${err.message}; still there: ${left}\n${stack.output()}`);
  });
  return (Date.now() - since) / 1000;
}

/** A client still connected: a request whose headers never end (the server cannot count it idle). */
function holdConnection(): Promise<Socket> {
  return new Promise((r, reject) => {
    const s = connect(ports.app, "127.0.0.1", () => {
      s.write(`GET /api/health HTTP/1.1\r\nHost: 127.0.0.1:${ports.app}\r\nX-Slow: `);
      r(s);
    });
    s.on("error", () => undefined);
    s.once("timeout", () => reject(new Error("no connection")));
  });
}

/** Signals a process group; one already gone is no error (it may have stopped before a second Ctrl-C). */
function signalGroup(pgid: number, signal: NodeJS.Signals): void {
  try {
    process.kill(-pgid, signal);
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== "ESRCH") throw err;
  }
}

/** SIGKILL to what is left of every stack of this file (only processes of theirs: a group id can be reused) and its MariaDB. */
function killLeftovers(): void {
  for (const s of stacks) {
    for (const pid of groupMembers(s.pgid)) {
      try {
        if (/npm|stack|tsx|node/.test(readFileSync(`/proc/${pid}/cmdline`, "utf8"))) process.kill(pid, "SIGKILL");
      } catch {
        // gone meanwhile
      }
    }
  }
  for (const pid of mariadbds()) process.kill(pid, "SIGKILL");
}

/** Clears what an earlier (failed) test left, so each test starts from a free data folder and free ports. */
async function clearLeftovers(): Promise<void> {
  killLeftovers();
  await until("the leftovers of an earlier test to be gone", async () => mariadbds().length === 0 && !(await listening(ports.app)) && !(await listening(ports.db)), 20_000);
  rmSync(`${DIR}/lotwise.pid`, { force: true });
}

/** A stack serving with its database answering: `reuse` when it still is, else a new one. */
async function servingStack(reuse?: Stack): Promise<Stack> {
  if (reuse && !reuse.done() && (await databaseAnswers().catch(() => false)) && (await fetch(`http://127.0.0.1:${ports.app}/api/health`).then((r) => r.ok, () => false))) return reuse;
  await clearLeftovers();
  const s = startStack();
  await serving(s);
  return s;
}

async function databaseAnswers(): Promise<boolean> {
  const c = await mysql.createConnection({ host: "127.0.0.1", port: ports.db, user: "lotwise", password: "lotwise-local-db", database: "lotwise", connectTimeout: 3000 });
  try {
    const [rows] = await c.query("SELECT 1 AS one");
    return (rows as { one: number }[])[0].one === 1;
  } finally {
    await c.end();
  }
}

beforeAll(async () => {
  rmSync(DIR, { recursive: true, force: true });
  ports = { app: await freePort(), sink: await freePort(), db: await freePort() };
});

afterAll(async () => {
  killLeftovers();
  await sleep(500);
  rmSync(DIR, { recursive: true, force: true });
}, 30_000);

describe("npm start: a second start, Ctrl-C and SIGTERM", () => {
  let first: Stack;

  it("a second npm start on the same data folder fails, saying why, and leaves the first one's MariaDB and app running", async () => {
    first = startStack();
    await serving(first);
    const [dbPid] = mariadbds();
    expect(dbPid).toBeGreaterThan(0);

    const second = startStack();
    const code = await Promise.race([second.exited, sleep(90_000).then(() => "still running")]);
    expect(code, second.output()).not.toBe(0);
    expect(code).not.toBe("still running");
    // The first one's database and app are untouched.
    expect(mariadbds()).toEqual([dbPid]);
    expect(await databaseAnswers()).toBe(true);
    expect((await fetch(`http://127.0.0.1:${ports.app}/api/health`)).status).toBe(200);
    expect(second.output()).toMatch(/already running on the data folder/);
    expect(second.output()).toContain("LOTWISE_DATA_DIR");
    console.log(`second npm start exited ${code}: ${second.output().split("\n").find((l) => l.includes("already running"))}`);
  }, 300_000);

  it("Ctrl-C (SIGINT to the group) with a client still connected stops the server, the mail stand-in and MariaDB", async () => {
    const s = await servingStack(first);
    const held = await holdConnection();
    const at = Date.now();
    signalGroup(s.pgid, "SIGINT");
    const took = await allGone(s, at);
    held.destroy();
    expect(existsSync(`${DIR}/lotwise.pid`)).toBe(false);
    expect(s.output()).toContain("stopping (SIGINT)");
    console.log(`Ctrl-C with a client connected: everything gone after ${took.toFixed(1)} s`);
  }, 120_000);

  it("Ctrl-C twice: the second one stops MariaDB at once, and nothing is left", async () => {
    const s = await servingStack();
    const held = await holdConnection();
    const at = Date.now();
    signalGroup(s.pgid, "SIGINT");
    await sleep(1500);
    signalGroup(s.pgid, "SIGINT");
    const took = await allGone(s, at);
    held.destroy();
    console.log(`Ctrl-C twice: everything gone after ${took.toFixed(1)} s`);
  }, 200_000);

  it("SIGTERM while MariaDB is still starting stops the MariaDB it started", async () => {
    await clearLeftovers();
    const s = startStack();
    await until("mariadbd to be starting", () => mariadbds().length > 0 || s.done(), 120_000);
    const at = Date.now();
    const phase = s.output().includes("lotwise: MariaDB on") ? "MariaDB answering, the app not yet" : "MariaDB not answering yet";
    signalGroup(s.pgid, "SIGTERM");
    const took = await allGone(s, at);
    expect(s.output()).not.toContain("Lotwise is running at");
    console.log(`SIGTERM while starting (${phase}): everything gone after ${took.toFixed(1)} s`);
  }, 200_000);

  it("SIGTERM to the Node process alone (as a service manager sends it) stops everything it started", async () => {
    const s = await servingStack();
    // the Node process running stack.ts (under the tsx command, as before, its child rather than the wrapper)
    const node = processesWith("scripts/stack.ts", "start").filter((pid) => groupMembers(s.pgid).includes(pid) && !/\/tsx(\0|\/dist\/cli)/.test(readFileSync(`/proc/${pid}/cmdline`, "utf8")));
    expect(node).toHaveLength(1);
    const at = Date.now();
    process.kill(node[0], "SIGTERM");
    const took = await allGone(s, at);
    console.log(`SIGTERM to the Node process: everything gone after ${took.toFixed(1)} s`);
  }, 200_000);
});
