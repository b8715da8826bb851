import { spawn, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createServer } from "node:net";
import { resolve } from "node:path";
import { loadConfig } from "../server/config/env";
import { createDataSource, openAndMigrate } from "../server/db/data-source";
import { startServer } from "../server/index";
import { startMailSink, type MailSink } from "../server/mail/mail-sink";
import { DEMO_COMPANY, DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../server/seed/demo";
import { seedDemoDesigns } from "../server/seed/demo-designs";
import { seedDemoRuns } from "../server/seed/demo-runs";
import { User } from "../server/entities";
import { ensureDatabase, signalStartedMariaDbs, startMariaDb, stopStartedMariaDbs, type MariaDb } from "./mariadb";
import { startRedis } from "./redis";
import { redactUrl } from "../server/engine/chunk-jobs";

type Mode = "start" | "dev" | "test" | "redis";
const mode = (process.argv[2] ?? "start") as Mode;

// Stopping. What runs in this process (the server, the mail stand-in, the database pool) ends with it; what runs
// outside must be stopped by pid: MariaDB (its own session, so Ctrl-C never reaches it: it stops after the app has
// let go of it), the client build, vitest and the dev processes. Rules:
// - the signal handlers are installed before anything starts, and stay (`on`, not `once`): Ctrl-C reaches npm, tsx
//   and this process, and tsx may relay it once more, so one Ctrl-C can arrive two or three times;
// - every in-process clean-up is bounded in time, so a client still connected (an open progress stream) cannot keep
//   MariaDB running; MariaDB is stopped last, every server this process started (even one still starting);
// - a second Ctrl-C (a second apart from the first) stops MariaDB and the child processes at once, a third kills them;
// - a MariaDB this process did not start (adopted) is never stopped by it.
interface Cleanup {
  what: string;
  ms: number;
  run: () => Promise<void> | void;
}
const cleanups: Cleanup[] = [];
const children = new Set<ChildProcess>();
const stopRequest = new AbortController();
let stopping: Promise<never> | null = null;
let urgency = 0;
let lastSignalAt = 0;
let lockFile: string | null = null;

/** Thrown by steps of main() that see a stop already under way: not an error worth reporting. */
class Stopping extends Error {}
const checkNotStopping = () => {
  if (stopRequest.signal.aborted) throw new Stopping("stopping");
};

function onSignal(name: NodeJS.Signals, code: number): void {
  const now = Date.now();
  if (urgency > 0 && now - lastSignalAt < 1000) return; // the same Ctrl-C, delivered again (npm, tsx)
  lastSignalAt = now;
  urgency++;
  if (urgency === 1) {
    console.log(`\nlotwise: stopping (${name})`);
    void stopAll(code);
  } else if (urgency === 2) {
    console.log(`lotwise: stopping now (${name} again): MariaDB and child processes without waiting for the server`);
    void stopOutside(5000, 0).finally(() => finish(code));
  } else {
    console.log(`lotwise: killing MariaDB and child processes (${name} a third time)`);
    for (const child of children) child.kill("SIGKILL");
    signalStartedMariaDbs("SIGKILL");
    finish(code);
  }
}
process.on("SIGINT", () => onSignal("SIGINT", 130));
process.on("SIGTERM", () => onSignal("SIGTERM", 143));
process.on("SIGHUP", () => onSignal("SIGHUP", 129));
process.on("uncaughtException", (error) => {
  console.error(`lotwise: ${error.stack ?? error.message}`);
  void stopAll(1);
});
process.on("unhandledRejection", (reason) => {
  console.error(`lotwise: ${(reason as Error)?.stack ?? String(reason)}`);
  void stopAll(1);
});
// Last resort for any exit that did not go through stopAll: nothing started here outlives this process.
process.on("exit", () => {
  for (const child of children) child.kill("SIGTERM");
  signalStartedMariaDbs("SIGTERM");
  releaseLock();
});

/** Stops everything, newest first, each step bounded; MariaDB last. Once: later calls get the same promise. */
function stopAll(code: number): Promise<never> {
  stopping ??= (async () => {
    stopRequest.abort();
    for (const cleanup of cleanups.splice(0).reverse()) {
      try {
        await bounded(Promise.resolve().then(cleanup.run), cleanup.ms, cleanup.what);
      } catch (error) {
        console.error(`lotwise: while stopping ${cleanup.what}: ${(error as Error).message}`);
      }
    }
    await stopOutside(30_000, 3000);
    return finish(code);
  })();
  return stopping;
}

/**
 * Child processes, then every MariaDB this process started (SIGTERM, SIGKILL after `graceMs`). A child gets
 * `patienceMs` to end on its own first (Ctrl-C reached it too; the tsx watcher kills its server at once on a second
 * signal), then SIGTERM, then SIGKILL after 5 s.
 */
async function stopOutside(graceMs: number, patienceMs: number): Promise<void> {
  await Promise.all([...children].map((child) => stopChild(child, patienceMs, 5000)));
  await stopStartedMariaDbs({ graceMs });
}

function finish(code: number): never {
  releaseLock();
  process.exit(code);
}

function bounded<T>(p: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout;
  return Promise.race([
    p,
    new Promise<never>((_, reject) => (timer = setTimeout(() => reject(new Error(`${what} did not stop within ${ms / 1000} s; going on`)), ms))),
  ]).finally(() => clearTimeout(timer));
}

async function stopChild(child: ChildProcess, patienceMs: number, ms: number): Promise<void> {
  const gone = () => child.exitCode !== null || child.signalCode !== null;
  if (gone()) return;
  const exited = new Promise<void>((r) => child.once("exit", () => r()));
  const timers = [
    setTimeout(() => gone() || child.kill("SIGTERM"), patienceMs),
    setTimeout(() => gone() || child.kill("SIGKILL"), patienceMs + ms),
  ];
  await exited;
  for (const t of timers) clearTimeout(t);
}

/** Spawns a child process this process answers for: stopped (by pid) when it stops. */
function spawnOwned(command: string, args: string[], options: Parameters<typeof spawn>[2]): ChildProcess {
  checkNotStopping();
  const child = spawn(command, args, options);
  children.add(child);
  child.once("exit", () => children.delete(child));
  return child;
}

/**
 * One `npm start` / `npm run dev` per data folder: a second one would share the first one's MariaDB and fail on its
 * ports. The lock is a file with the owner's pid, made with O_EXCL; one whose process is gone is taken over.
 */
function claimDataDir(dir: string, dbPort: number): void {
  mkdirSync(dir, { recursive: true });
  const file = resolve(dir, "lotwise.pid");
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      writeFileSync(file, `${process.pid}\n`, { flag: "wx" });
      lockFile = file;
      return;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    }
    const owner = Number.parseInt(readFileSync(file, "utf8").trim(), 10);
    if (Number.isInteger(owner) && owner > 0 && owner !== process.pid && isLotwise(owner)) {
      throw new Error(
        `another Lotwise (pid ${owner}) is already running on the data folder ${dir} (MariaDB port ${dbPort}); it keeps running.\n` +
          "  Stop it first (Ctrl-C in its terminal), or start this one with a data folder and ports of its own:\n" +
          "  LOTWISE_DATA_DIR, LOTWISE_DB_PORT, LOTWISE_PORT and LOTWISE_MAIL_SINK_PORT",
      );
    }
    rmSync(file, { force: true }); // left by a Lotwise that is gone
  }
  throw new Error(`could not claim the data folder ${dir} (${file})`);
}

function releaseLock(): void {
  if (!lockFile) return;
  try {
    if (readFileSync(lockFile, "utf8").trim() === String(process.pid)) rmSync(lockFile, { force: true });
  } catch {
    // already gone
  }
  lockFile = null;
}

function isLotwise(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return readFileSync(`/proc/${pid}/cmdline`, "utf8").includes("stack.ts");
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === "EPERM";
  }
}

/** Fails early, and clearly, when a port this start needs is taken (before MariaDB or migrations are touched). */
async function ensurePortFree(host: string, port: number, setting: string): Promise<void> {
  const problem = await new Promise<string | null>((resolvePort) => {
    const probe = createServer();
    probe.once("error", (error: NodeJS.ErrnoException) => resolvePort(error.code ?? error.message));
    probe.listen(port, host, () => probe.close(() => resolvePort(null)));
  });
  if (problem === "EADDRINUSE") throw new Error(`${host}:${port} is already in use (another Lotwise, or another program); stop it or set ${setting} to a free port`);
  if (problem) throw new Error(`cannot listen on ${host}:${port} (${problem}); set ${setting}`);
}

async function main(): Promise<number> {
  if (!["start", "dev", "test", "redis"].includes(mode)) throw new Error(`unknown mode "${mode}" (start, dev, test or redis)`);
  if (mode === "test") return runTests();
  if (mode === "redis") return runRedis();

  const config = loadConfig();
  const dataDir = resolve(process.env.LOTWISE_DATA_DIR ?? ".tmp/mariadb");
  claimDataDir(dataDir, config.db.port);
  await ensurePortFree(config.host, config.port, "LOTWISE_PORT");
  if (!config.smtp.host) await ensurePortFree("127.0.0.1", config.smtp.sinkPort, "LOTWISE_MAIL_SINK_PORT");
  const db = await startDb(dataDir, config.db.port);
  ensureDatabase(db, config.db);
  const ds = createDataSource(config.db, { poolSize: 3 });
  cleanups.push({ what: "the database pool", ms: 5000, run: () => (ds.isInitialized ? ds.destroy() : undefined) });
  const ran = await openAndMigrate(ds);
  checkNotStopping();
  const added = await seedDemo(ds);
  const users = ds.getRepository(User);
  const designer = await users.findOneByOrFail({ email: demoEmail("designer") });
  const planner = await users.findOneByOrFail({ email: demoEmail("planner") });
  const demo = await seedDemoDesigns(ds, { designer: designer.id, planner: planner.id });
  checkNotStopping();
  console.log(`lotwise: database ${config.db.name} ready (${ran} migration(s) applied, ${added} demo account(s) and ${demo.designsAdded} demo design(s) added)`);

  if (!config.smtp.host) {
    const sink: MailSink = await startMailSink(ds, { port: config.smtp.sinkPort });
    cleanups.push({ what: "the mail stand-in", ms: 3000, run: () => sink.close() });
    checkNotStopping();
    console.log(`lotwise: mail stand-in listening on 127.0.0.1:${sink.port} (messages appear in the Outbox)`);
  }

  if (mode === "dev") {
    const env = { ...process.env, NODE_ENV: "development" };
    supervise(spawnOwned("node_modules/.bin/tsx", ["watch", "--clear-screen=false", "server/index.ts"], { stdio: "inherit", env }));
    supervise(spawnOwned("node_modules/.bin/vite", [], { stdio: "inherit", env }));
    printSignIns(`http://127.0.0.1:${process.env.LOTWISE_DEV_PORT ?? 5173}`);
    return new Promise(() => undefined);
  }

  await build();
  if (config.redisUrl) console.log(`lotwise: distributed mode: runs go to Redis at ${redactUrl(config.redisUrl)}; start workers with \`npm run worker\``);
  const server = await startServer(config);
  cleanups.push({
    what: "the server",
    ms: 15_000,
    run: async () => {
      // Idle connections close at once; a request still running (an open progress stream) gets 2 s, then is cut.
      const cut = setTimeout(() => server.server.closeAllConnections(), 2000);
      try {
        await server.close();
      } finally {
        clearTimeout(cut);
      }
    },
  });
  checkNotStopping();
  const queued = await seedDemoRuns(server.ctx, demo.designs, demoEmail("analyst"));
  if (queued) console.log(`lotwise: ${queued} demo run(s) queued; they finish in the background`);
  printSignIns(`http://${config.host}:${config.port}`);
  return new Promise(() => undefined);
}

/** One static check of `npm test`: it counts as one test in the closing line, failed when the tool exits non-zero. */
interface Check {
  name: string;
  command: string;
  args: string[];
}

/**
 * The type-check (TypeScript 7 over client, server, workers, shared, tests and scripts: tsconfig.json's include) and
 * the linter (oxlint with .oxlintrc.json: correctness rules and the import boundaries). LOTWISE_SKIP_CHECKS=1 skips
 * them while iterating on one test file.
 */
const CHECKS: Check[] = [
  { name: "type-check (tsc --noEmit -p tsconfig.json)", command: "node_modules/.bin/tsc", args: ["--noEmit", "-p", "tsconfig.json"] },
  { name: "lint (oxlint)", command: "node_modules/.bin/oxlint", args: [] },
];

async function runChecks(): Promise<{ passed: number; failed: string[] }> {
  if (process.env.LOTWISE_SKIP_CHECKS === "1") return { passed: 0, failed: [] };
  const failed: string[] = [];
  let passed = 0;
  for (const check of CHECKS) {
    console.log(`lotwise: ${check.name}`);
    const child = spawnOwned(check.command, check.args, { stdio: "inherit" });
    const code = await new Promise<number | null>((r) => child.once("exit", (c) => r(c)));
    checkNotStopping();
    if (code === 0) passed++;
    else {
      failed.push(check.name);
      console.error(`lotwise: ${check.name} FAILED (exit ${code})`);
    }
  }
  return { passed, failed };
}

async function runTests(): Promise<number> {
  const checks = await runChecks();
  const port = Number(process.env.LOTWISE_TEST_DB_PORT ?? 3308);
  const db = await startDb(process.env.LOTWISE_TEST_DATA_DIR ?? ".tmp/mariadb-test", port);
  const creds = { name: "lotwise_test", user: "lotwise_test", password: "lotwise-test-db" };
  ensureDatabase(db, { ...creds, everything: true });
  await build();
  mkdirSync(".tmp", { recursive: true });
  const report = resolve(port === 3308 ? ".tmp/vitest.json" : `.tmp/vitest-${port}.json`);
  const env = {
    ...process.env,
    NODE_ENV: "test",
    LOTWISE_DB_PORT: String(port),
    LOTWISE_DB_NAME: creds.name,
    LOTWISE_DB_USER: creds.user,
    LOTWISE_DB_PASSWORD: creds.password,
    LOTWISE_LOG_LEVEL: process.env.LOTWISE_LOG_LEVEL ?? "silent",
    LOTWISE_TEST_DB_READY: "1",
  };
  const extra = process.argv.slice(3);
  const vitest = spawnOwned("node_modules/.bin/vitest", ["run", "--reporter=default", "--reporter=json", `--outputFile=${report}`, ...extra], { stdio: "inherit", env });
  const code = await new Promise<number>((r) => vitest.once("exit", (c) => r(c ?? 1)));
  let passed = 0;
  let failed = code === 0 ? 0 : 1;
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, "utf8")) as { numPassedTests: number; numFailedTests: number; numFailedTestSuites: number };
    passed = r.numPassedTests;
    failed = r.numFailedTests + (r.numFailedTests === 0 && code !== 0 ? Math.max(1, r.numFailedTestSuites) : 0);
  }
  if (checks.failed.length) console.log(`lotwise: failed checks: ${checks.failed.join("; ")}`);
  passed += checks.passed;
  failed += checks.failed.length;
  console.log(`${passed} passed, ${failed} failed`);
  return code === 0 && failed === 0 ? 0 : 1;
}

/**
 * `npm run redis`: a private redis-server for distributed mode, data in LOTWISE_REDIS_DIR (default .tmp/redis), on
 * LOTWISE_REDIS_PORT (default 6390), bound to loopback plus the addresses in LOTWISE_REDIS_BIND (space-separated) for
 * worker hosts elsewhere. Runs until Ctrl-C.
 */
async function runRedis(): Promise<number> {
  const port = Number(process.env.LOTWISE_REDIS_PORT ?? 6390);
  const dir = process.env.LOTWISE_REDIS_DIR ?? ".tmp/redis";
  const extraBind = (process.env.LOTWISE_REDIS_BIND ?? "").split(/\s+/).filter(Boolean);
  // Reachable beyond loopback: require a password (made once, kept in the data folder, readable by root only).
  let password: string | undefined;
  if (extraBind.length > 0) {
    mkdirSync(dir, { recursive: true });
    const file = `${dir}/password`;
    if (!existsSync(file)) writeFileSync(file, `${randomBytes(18).toString("base64url")}\n`, { mode: 0o600 });
    password = readFileSync(file, "utf8").trim();
  }
  const redis = await startRedis({ dir, port, extraBind, password });
  cleanups.push({ what: "Redis", ms: 20_000, run: () => redis.stop() });
  const auth = password ? `:${password}@` : "";
  console.log(`lotwise: Redis on ${["127.0.0.1", ...extraBind].join(", ")} port ${port} (data in ${dir}, append-only file${password ? `, password in ${dir}/password` : ", loopback only, no password"})`);
  console.log(`  server:  LOTWISE_REDIS_URL=redis://${auth}127.0.0.1:${port}/ npm start`);
  console.log(`  workers: LOTWISE_REDIS_URL=redis://${auth}${extraBind[0] ?? "<this host>"}:${port}/ npm run worker   (Ctrl-C stops Redis)`);
  setInterval(() => undefined, 1 << 30); // redis-server runs detached: keep this process (and its Ctrl-C) alive
  return new Promise(() => undefined);
}

async function startDb(dir: string, port: number): Promise<MariaDb> {
  // Stopped by stopAll (stopStartedMariaDbs) if this process started it; left alone if it was adopted.
  const db = await startMariaDb({ dir, port, signal: stopRequest.signal });
  checkNotStopping();
  console.log(`lotwise: MariaDB on 127.0.0.1:${port} (data in ${dir}${db.startedHere ? "" : `, already running as pid ${db.pid}: left running when this stops`})`);
  return db;
}

async function build(): Promise<void> {
  if (process.env.LOTWISE_SKIP_BUILD === "1") return;
  console.log("lotwise: building the client (vite build)");
  const child = spawnOwned("node_modules/.bin/vite", ["build", "--logLevel", "warn"], { stdio: "inherit" });
  const code = await new Promise<number | null>((r) => child.once("exit", (c) => r(c)));
  checkNotStopping();
  if (code !== 0) throw new Error("the client build failed");
}

function supervise(child: ChildProcess): void {
  child.once("exit", (code) => {
    if (!stopRequest.signal.aborted) {
      console.error(`lotwise: a dev process exited (${code}); stopping`);
      void stopAll(1);
    }
  });
}

function demoEmail(role: string): string {
  return DEMO_PEOPLE.find((p) => p.roles.includes(role as never))!.email;
}

function printSignIns(url: string): void {
  const width = Math.max(...DEMO_PEOPLE.map((p) => p.email.length));
  console.log(`\nLotwise is running at ${url}  (Ctrl-C stops everything)\n`);
  console.log(`Demo: ${DEMO_COMPANY} (invented). Every demo account's password: ${DEMO_PASSWORD}`);
  for (const p of DEMO_PEOPLE) console.log(`  ${p.email.padEnd(width)}  ${p.roles.join(", ")}  (${p.name})`);
  console.log("");
}

main()
  .then((code) => stopAll(code))
  .catch((error: Error) => {
    if (!(error instanceof Stopping) && !stopRequest.signal.aborted) console.error(`lotwise: ${error.message}`);
    return stopAll(1);
  });
