import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { resolve } from "node:path";
import { loadConfig } from "../server/config/env";
import { createDataSource, openAndMigrate } from "../server/db/data-source";
import { startServer } from "../server/index";
import { startMailSink, type MailSink } from "../server/mail/mail-sink";
import { DEMO_COMPANY, DEMO_PASSWORD, DEMO_PEOPLE, seedDemo } from "../server/seed/demo";
import { seedDemoDesigns } from "../server/seed/demo-designs";
import { seedDemoRuns } from "../server/seed/demo-runs";
import { User } from "../server/entities";
import { ensureDatabase, startMariaDb, type MariaDb } from "./mariadb";
import { startRedis } from "./redis";
import { redactUrl } from "../server/engine/chunk-jobs";

type Mode = "start" | "dev" | "test" | "redis";
const mode = (process.argv[2] ?? "start") as Mode;
const cleanups: Array<() => Promise<void> | void> = [];
let stopping = false;

async function stopAll(code: number): Promise<never> {
  if (!stopping) {
    stopping = true;
    for (const cleanup of cleanups.reverse()) {
      try {
        await cleanup();
      } catch (error) {
        console.error(`lotwise: while stopping: ${(error as Error).message}`);
      }
    }
  }
  process.exit(code);
}
process.once("SIGINT", () => void stopAll(130));
process.once("SIGTERM", () => void stopAll(143));

async function main(): Promise<number> {
  if (!["start", "dev", "test", "redis"].includes(mode)) throw new Error(`unknown mode "${mode}" (start, dev, test or redis)`);
  if (mode === "test") return runTests();
  if (mode === "redis") return runRedis();

  const config = loadConfig();
  const dataDir = process.env.LOTWISE_DATA_DIR ?? ".tmp/mariadb";
  const db = await startDb(dataDir, config.db.port);
  ensureDatabase(db, config.db);
  const ds = createDataSource(config.db, { poolSize: 3 });
  const ran = await openAndMigrate(ds);
  const added = await seedDemo(ds);
  const users = ds.getRepository(User);
  const designer = await users.findOneByOrFail({ email: demoEmail("designer") });
  const planner = await users.findOneByOrFail({ email: demoEmail("planner") });
  const demo = await seedDemoDesigns(ds, { designer: designer.id, planner: planner.id });
  cleanups.push(() => ds.destroy());
  console.log(`lotwise: database ${config.db.name} ready (${ran} migration(s) applied, ${added} demo account(s) and ${demo.designsAdded} demo design(s) added)`);

  if (!config.smtp.host) {
    const sink: MailSink = await startMailSink(ds, { port: config.smtp.sinkPort });
    cleanups.push(() => sink.close());
    console.log(`lotwise: mail stand-in listening on 127.0.0.1:${sink.port} (messages appear in the Outbox)`);
  }

  if (mode === "dev") {
    const env = { ...process.env, NODE_ENV: "development" };
    supervise(spawn("node_modules/.bin/tsx", ["watch", "--clear-screen=false", "server/index.ts"], { stdio: "inherit", env }));
    supervise(spawn("node_modules/.bin/vite", [], { stdio: "inherit", env }));
    printSignIns(`http://127.0.0.1:${process.env.LOTWISE_DEV_PORT ?? 5173}`);
    return new Promise(() => undefined);
  }

  build();
  if (config.redisUrl) console.log(`lotwise: distributed mode: runs go to Redis at ${redactUrl(config.redisUrl)}; start workers with \`npm run worker\``);
  const server = await startServer(config);
  cleanups.push(() => server.close());
  const queued = await seedDemoRuns(server.ctx, demo.designs, demoEmail("analyst"));
  if (queued) console.log(`lotwise: ${queued} demo run(s) queued; they finish in the background`);
  printSignIns(`http://${config.host}:${config.port}`);
  return new Promise(() => undefined);
}

async function runTests(): Promise<number> {
  const port = Number(process.env.LOTWISE_TEST_DB_PORT ?? 3308);
  const db = await startDb(process.env.LOTWISE_TEST_DATA_DIR ?? ".tmp/mariadb-test", port);
  const creds = { name: "lotwise_test", user: "lotwise_test", password: "lotwise-test-db" };
  ensureDatabase(db, { ...creds, everything: true });
  build();
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
  const vitest = spawn("node_modules/.bin/vitest", ["run", "--reporter=default", "--reporter=json", `--outputFile=${report}`, ...extra], { stdio: "inherit", env });
  const code = await new Promise<number>((r) => vitest.once("exit", (c) => r(c ?? 1)));
  let passed = 0;
  let failed = code === 0 ? 0 : 1;
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, "utf8")) as { numPassedTests: number; numFailedTests: number; numFailedTestSuites: number };
    passed = r.numPassedTests;
    failed = r.numFailedTests + (r.numFailedTests === 0 && code !== 0 ? Math.max(1, r.numFailedTestSuites) : 0);
  }
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
  cleanups.push(() => redis.stop());
  const auth = password ? `:${password}@` : "";
  console.log(`lotwise: Redis on ${["127.0.0.1", ...extraBind].join(", ")} port ${port} (data in ${dir}, append-only file${password ? `, password in ${dir}/password` : ", loopback only, no password"})`);
  console.log(`  server:  LOTWISE_REDIS_URL=redis://${auth}127.0.0.1:${port}/ npm start`);
  console.log(`  workers: LOTWISE_REDIS_URL=redis://${auth}${extraBind[0] ?? "<this host>"}:${port}/ npm run worker   (Ctrl-C stops Redis)`);
  setInterval(() => undefined, 1 << 30); // redis-server runs detached: keep this process (and its Ctrl-C) alive
  return new Promise(() => undefined);
}

async function startDb(dir: string, port: number): Promise<MariaDb> {
  const db = await startMariaDb({ dir, port });
  cleanups.push(() => db.stop());
  console.log(`lotwise: MariaDB on 127.0.0.1:${port} (data in ${dir})`);
  return db;
}

function build(): void {
  if (process.env.LOTWISE_SKIP_BUILD === "1") return;
  console.log("lotwise: building the client (vite build)");
  const r = spawnSync("node_modules/.bin/vite", ["build", "--logLevel", "warn"], { stdio: "inherit" });
  if (r.status !== 0) throw new Error("the client build failed");
}

function supervise(child: ChildProcess): void {
  cleanups.push(() => void child.kill("SIGTERM"));
  child.once("exit", (code) => {
    if (!stopping) {
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
    console.error(`lotwise: ${error.message}`);
    return stopAll(1);
  });
