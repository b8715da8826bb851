// `npm run soak -- --fairness`: instead of the mixed load, the fairness scenario (fairnessScenario below).
// `npm run soak [-- --minutes N]`: a few minutes (default 3) of mixed load on loopback against a real Lotwise server
// process on a private database — run submissions (each submitter waits for its run on the dashboard, then submits
// the next), dashboard readers (GET /api/runs/:id) and history readers (GET /api/runs with paging and sorting) — and
// prints the latency percentiles, throughput and errors per kind of request and the server's memory (RSS and V8
// heap) sampled every 2 s, with a verdict on whether memory stayed flat. It starts everything it needs (a private
// MariaDB in .tmp/mariadb-soak on 127.0.0.1:3334 — LOTWISE_SOAK_DB_PORT / LOTWISE_SOAK_DATA_DIR to move it —, the
// mail stand-in, the server) and stops all of it at the end or on Ctrl-C.
//
// The load client below (createLoadClient, percentile, runLoops) is also used by tests/integration/load.test.ts.
import { fork, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { freePort } from "./worker-process";
import { monitorEventLoopDelay, performance } from "node:perf_hooks";

// ---------------------------------------------------------------- load client (shared with the load test)

/** One kind of request's figures. */
export interface KindSummary {
  kind: string;
  /** requests that ended (success or failure), not counting 429 retries */
  requests: number;
  failed: number;
  /** 429 answers that the client waited out (Retry-After) and retried */
  retried429: number;
  /** milliseconds, of successful requests, from the first attempt to the answer (retries included) */
  p50: number;
  p99: number;
  max: number;
}

export interface LoadClient {
  /** One request with JSON in and out; 429 is retried after Retry-After (at most `maxRetries` times). */
  send(kind: string, method: string, path: string, options?: { cookie?: string; body?: unknown; expect?: number[] }): Promise<{ status: number; body: any; headers: Headers }>;
  summary(): KindSummary[];
  /** failures, newest last (at most 50 kept) */
  readonly failures: string[];
  /** requests ended since the client was made (or since reset) */
  total(): number;
  reset(): void;
}

/** p-th percentile (0..100) of numbers, nearest-rank on the sorted values; NaN for none. */
export function percentile(values: readonly number[], p: number): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.min(sorted.length, Math.max(1, Math.ceil((p / 100) * sorted.length)));
  return sorted[rank - 1];
}

/**
 * A fetch-based client for one origin (loopback) that keeps per-kind latencies and failures. A request fails when it
 * throws (connection refused, reset), or answers a status outside `expect` (default 2xx) other than 429.
 */
export function createLoadClient(origin: string, options: { maxRetries?: number; maxRetryWaitMs?: number } = {}): LoadClient {
  const maxRetries = options.maxRetries ?? 8;
  const maxWait = options.maxRetryWaitMs ?? 2000;
  let stats = new Map<string, { latencies: number[]; failed: number; retried429: number }>();
  const failures: string[] = [];
  let ended = 0;
  const of = (kind: string) => {
    let s = stats.get(kind);
    if (!s) stats.set(kind, (s = { latencies: [], failed: 0, retried429: 0 }));
    return s;
  };
  const fail = (kind: string, what: string) => {
    of(kind).failed++;
    failures.push(`${kind}: ${what}`);
    if (failures.length > 50) failures.shift();
  };
  return {
    failures,
    async send(kind, method, path, o = {}) {
      const s = of(kind);
      const started = performance.now();
      for (let attempt = 0; ; attempt++) {
        let res: Response;
        let body: any = null;
        try {
          res = await fetch(`${origin}${path}`, {
            method,
            headers: { ...(o.body !== undefined ? { "content-type": "application/json" } : {}), ...(o.cookie ? { cookie: o.cookie } : {}), ...(method !== "GET" ? { origin } : {}) },
            body: o.body !== undefined ? JSON.stringify(o.body) : undefined,
          });
          const text = await res.text();
          body = text && (res.headers.get("content-type") ?? "").includes("json") ? JSON.parse(text) : text;
        } catch (err) {
          ended++;
          fail(kind, `${method} ${path}: ${(err as Error).message}`);
          throw err;
        }
        if (res.status === 429 && attempt < maxRetries) {
          s.retried429++;
          const after = Number(res.headers.get("retry-after"));
          await new Promise((r) => setTimeout(r, Math.min(maxWait, Number.isFinite(after) && after > 0 ? after * 1000 : 100 * 2 ** attempt)));
          continue;
        }
        ended++;
        const ok = o.expect ? o.expect.includes(res.status) : res.status >= 200 && res.status < 300;
        if (ok) s.latencies.push(performance.now() - started);
        else fail(kind, `${method} ${path}: ${res.status} ${JSON.stringify(body).slice(0, 200)}`);
        return { status: res.status, body, headers: res.headers };
      }
    },
    summary() {
      return [...stats.entries()].map(([kind, s]) => ({
        kind, requests: s.latencies.length + s.failed, failed: s.failed, retried429: s.retried429,
        p50: percentile(s.latencies, 50), p99: percentile(s.latencies, 99), max: s.latencies.length ? Math.max(...s.latencies) : Number.NaN,
      }));
    },
    total: () => ended,
    reset() {
      stats = new Map();
      failures.length = 0;
      ended = 0;
    },
  };
}

/** Runs `count` copies of `loop` at once until each returns false (or `until()` is true); resolves when all have stopped. */
export async function runLoops(count: number, loop: (index: number) => Promise<boolean | void>, until: () => boolean = () => false): Promise<void> {
  await Promise.all(
    Array.from({ length: count }, async (_, i) => {
      while (!until()) {
        try {
          if ((await loop(i)) === false) return;
        } catch {
          // counted by the client; go on
        }
      }
    }),
  );
}

/** Signs in over HTTP and returns the Cookie header value. */
export async function signInOver(client: LoadClient, email: string, password: string): Promise<string> {
  const res = await client.send("sign-in", "POST", "/api/auth/sign-in", { body: { email, password } });
  if (res.status !== 200) throw new Error(`sign-in failed: ${res.status} ${JSON.stringify(res.body)}`);
  return (res.headers.getSetCookie?.() ?? []).map((c) => c.split(";")[0]).join("; ");
}

/** The figures as an aligned table. */
export function formatSummary(rows: KindSummary[], seconds: number): string {
  const total = rows.reduce((n, r) => n + r.requests, 0);
  const lines = [
    `${"request".padEnd(18)}${"count".padStart(8)}${"failed".padStart(8)}${"429s".padStart(7)}${"p50 ms".padStart(9)}${"p99 ms".padStart(9)}${"max ms".padStart(9)}${"req/s".padStart(9)}`,
    ...rows.map((r) =>
      `${r.kind.padEnd(18)}${String(r.requests).padStart(8)}${String(r.failed).padStart(8)}${String(r.retried429).padStart(7)}` +
      `${r.p50.toFixed(1).padStart(9)}${r.p99.toFixed(1).padStart(9)}${r.max.toFixed(1).padStart(9)}${(r.requests / seconds).toFixed(1).padStart(9)}`),
    `${"all".padEnd(18)}${String(total).padStart(8)}${String(rows.reduce((n, r) => n + r.failed, 0)).padStart(8)}${String(rows.reduce((n, r) => n + r.retried429, 0)).padStart(7)}` +
      `${"".padStart(27)}${(total / seconds).toFixed(1).padStart(9)}`,
  ];
  return lines.join("\n");
}

// ---------------------------------------------------------------- the soak itself

/** A 3rd-order Butterworth low-pass, 100 MHz, 50 Ω (C = 1/(2π·100 MHz·50 Ω) = 31.83 pF, L = 2·50 Ω/(2π·100 MHz) = 159.2 nH), parts ±5 %. */
const SOAK_NETLIST = {
  name: "Soak low-pass",
  ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }],
  parts: [
    { ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 3.1830988618379065e-11, tolerance: 0.05 },
    { ref: "L2", kind: "L", nodes: ["n1", "n2"], value: 1.5915494309189535e-7, tolerance: 0.05 },
    { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: 3.1830988618379065e-11, tolerance: 0.05 },
  ],
};
const SOAK_LIMITS = { rules: [{ metric: "s21_db", from: 1e6, to: 85e6, min: -1.5 }, { metric: "s21_db", from: 250e6, to: 1e9, max: -20 }] };

/** The server's worst event-loop delay per 2 s report, with when it arrived (performance.now of this process). */
const loopDelays: { t: number; maxMs: number }[] = [];

/** rss and heapUsed every 2 s; liveHeap (heapUsed right after a full GC: what is really kept) every 10 s */
interface MemorySample { t: number; rss: number; heapUsed: number; liveHeap?: number }

function parseMinutes(argv: string[]): number {
  const i = argv.indexOf("--minutes");
  const raw = i >= 0 ? argv[i + 1] : (argv.find((a) => a.startsWith("--minutes="))?.split("=")[1] ?? "3");
  const n = Number(raw);
  if (!Number.isFinite(n) || n <= 0 || n > 120) throw new Error(`--minutes must be a number in (0, 120] (got "${raw}")`);
  return n;
}


const mb = (bytes: number) => (bytes / 1048576).toFixed(1);
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / Math.max(1, xs.length);

/** Child mode: the server itself, reporting its memory to the parent over IPC every 2 s. */
async function serve(): Promise<void> {
  const { loadConfig } = await import("../server/config/env");
  const { startServer } = await import("../server/index");
  const running = await startServer(loadConfig());
  const gc = (globalThis as { gc?: () => void }).gc; // --expose-gc, given by the parent
  // How long the server's event loop was held up, worst case per 2 s report (what a request waits for, CPU aside).
  const loop = monitorEventLoopDelay({ resolution: 10 });
  loop.enable();
  let tick = 0;
  const timer = setInterval(() => {
    const m = process.memoryUsage();
    let liveHeap: number | undefined;
    if (gc && process.env.LOTWISE_SOAK_NO_GC !== "1" && ++tick % 5 === 0) {
      gc();
      liveHeap = process.memoryUsage().heapUsed;
    }
    process.send?.({ type: "memory", rss: m.rss, heapUsed: m.heapUsed, liveHeap, loopDelayMaxMs: loop.max / 1e6 });
    loop.reset();
  }, 2000);
  process.send?.({ type: "ready" });
  process.on("message", (msg: { type?: string }) => {
    if (msg?.type !== "stop") return;
    clearInterval(timer);
    void running.close().then(() => process.exit(0), () => process.exit(1));
  });
  process.on("disconnect", () => process.exit(0)); // the parent died: do not linger
  process.on("SIGINT", () => undefined); // Ctrl-C reaches the whole group: the parent stops this server in order
}

async function soak(): Promise<void> {
  const minutes = parseMinutes(process.argv.slice(2));
  const durationMs = minutes * 60_000;
  const { ensureDatabase, startMariaDb } = await import("./mariadb");
  const mysql = (await import("mysql2/promise")).default;
  const { createDataSource, openAndMigrate } = await import("../server/db/data-source");
  const { hashPassword } = await import("../server/auth/passwords");
  const { User } = await import("../server/entities");
  const { startMailSink } = await import("../server/mail/mail-sink");

  const cleanups: (() => Promise<void> | void)[] = [];
  let stopping = false;
  let stopped: Promise<void> | null = null;
  /** Stops what was started, newest first; once (a signal and the normal end may both ask). */
  const stopAll = () =>
    (stopped ??= (async () => {
      stopping = true;
      for (const c of cleanups.splice(0).reverse()) {
        try {
          await c();
        } catch (err) {
          console.error(`soak: while stopping: ${(err as Error).message}`);
        }
      }
    })());
  // `on`, not `once`: Ctrl-C can arrive twice (from the terminal and relayed by the tsx wrapper), and a second
  // signal with no listener would end this process before MariaDB is stopped.
  const onSignal = (code: number) => () => {
    if (!stopped) console.log("\nsoak: stopping (signal)");
    void stopAll().then(() => process.exit(code));
  };
  process.on("SIGINT", onSignal(130));
  process.on("SIGTERM", onSignal(143));

  try {
    const dbPort = Number(process.env.LOTWISE_SOAK_DB_PORT ?? 3334);
    const creds = { host: "127.0.0.1", port: dbPort, name: "lotwise_soak", user: "lotwise_soak", password: "lotwise-soak-db" };
    const db = await startMariaDb({ dir: process.env.LOTWISE_SOAK_DATA_DIR ?? ".tmp/mariadb-soak", port: dbPort });
    cleanups.push(() => db.stop());
    ensureDatabase(db, creds);
    const admin = await mysql.createConnection({ host: creds.host, port: dbPort, user: creds.user, password: creds.password });
    await admin.query(`DROP DATABASE IF EXISTS ${creds.name}`);
    await admin.query(`CREATE DATABASE ${creds.name} CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
    await admin.end();
    const ds = createDataSource(creds, { poolSize: 2 });
    await openAndMigrate(ds);
    cleanups.push(() => ds.destroy());
    const sink = await startMailSink(ds, { port: 0 });
    cleanups.push(() => sink.close());
    const password = "soak-password-2026";
    const passwordHash = await hashPassword(password);
    const emails = ["soak-1@lotwise.test", "soak-2@lotwise.test", "soak-3@lotwise.test"];
    for (const email of emails) {
      await ds.getRepository(User).insert({ id: randomUUID(), email, name: "Soak Tester", roles: ["designer", "planner", "analyst"], active: true, passwordHash });
    }
    console.log(`soak: MariaDB on 127.0.0.1:${dbPort}, database ${creds.name} migrated, mail stand-in on 127.0.0.1:${sink.port}`);

    const port = await freePort();
    const origin = `http://127.0.0.1:${port}`;
    const fairness = process.argv.includes("--fairness");
    const workers = process.env.LOTWISE_WORKERS ?? (fairness ? "2" : "1");
    const env: NodeJS.ProcessEnv = {
      ...process.env, NODE_ENV: "production", LOTWISE_HOST: "127.0.0.1", LOTWISE_PORT: String(port),
      LOTWISE_PUBLIC_ORIGIN: origin, LOTWISE_DB_HOST: "127.0.0.1", LOTWISE_DB_PORT: String(dbPort), LOTWISE_DB_NAME: creds.name, LOTWISE_DB_USER: creds.user,
      LOTWISE_DB_PASSWORD: creds.password, LOTWISE_MAIL_SINK_PORT: String(sink.port), LOTWISE_WORKERS: workers, LOTWISE_MAX_RUNNING: fairness ? "4" : "1",
      // the memory verdict's forced full collections (every 10 s) would show up as latency in the fairness figures
      ...(fairness ? { LOTWISE_SOAK_NO_GC: "1" } : {}),
      LOTWISE_LOG_LEVEL: process.env.LOTWISE_LOG_LEVEL ?? "warn",
    };
    delete env.LOTWISE_SMTP_HOST; // mail goes to this script's stand-in
    const child: ChildProcess = fork(new URL(import.meta.url).pathname, ["--serve"], {
      execArgv: ["--import", "tsx", "--expose-gc", ...(process.env.LOTWISE_SOAK_TRACE_GC === "1" ? ["--trace-gc"] : [])],
      env,
      stdio: ["ignore", "inherit", "inherit", "ipc"],
    });
    const memory: MemorySample[] = [];
    loopDelays.length = 0;
    let soakStart = 0;
    const ready = new Promise<void>((resolve, reject) => {
      child.on("message", (m: { type: string; rss?: number; heapUsed?: number; liveHeap?: number }) => {
        if (m.type === "ready") resolve();
        if (m.type === "memory" && soakStart) memory.push({ t: performance.now() - soakStart, rss: m.rss!, heapUsed: m.heapUsed!, liveHeap: m.liveHeap });
        if (m.type === "memory") loopDelays.push({ t: performance.now(), maxMs: (m as { loopDelayMaxMs?: number }).loopDelayMaxMs ?? 0 });
      });
      child.once("exit", (code) => reject(new Error(`the server exited (${code})`)));
    });
    cleanups.push(async () => {
      if (child.exitCode !== null || child.signalCode !== null) return;
      const exited = new Promise<void>((r) => child.once("exit", () => r()));
      child.send({ type: "stop" });
      const timer = setTimeout(() => child.kill("SIGKILL"), 20_000);
      await exited;
      clearTimeout(timer);
    });
    await ready;
    console.log(`soak: server (pid ${child.pid}, ${workers} worker thread(s), one run at a time) on ${origin}; ${minutes} min of load starting`);

    // Set-up over the API: a design with a revision, a limit set, one warm-up run.
    const client = createLoadClient(origin);
    const cookies: string[] = [];
    for (const email of emails) cookies.push(await signInOver(client, email, password));
    const design = await client.send("setup", "POST", "/api/designs", { cookie: cookies[0], body: { name: "Soak low-pass", netlist: SOAK_NETLIST, sweep: { from: 1e6, to: 1e9, points: 101, scale: "log" } } });
    const designId: string = design.body.design.id;
    const revisionId: string = design.body.revision.id;
    const limitSet = await client.send("setup", "POST", `/api/designs/${designId}/limit-sets`, { cookie: cookies[0], body: { name: "acceptance", limits: SOAK_LIMITS, lotSize: 1000 } });
    const limitSetId: string = limitSet.body.limitSet.id;
    const runIds: string[] = [];
    const warm = await client.send("setup", "POST", "/api/runs", { cookie: cookies[0], body: { revisionId, limitSetId, trials: 200, seed: 1 } });
    runIds.push(warm.body.run.id);
    for (let i = 0; i < 100; i++) {
      const r = await client.send("setup", "GET", `/api/runs/${warm.body.run.id}`, { cookie: cookies[0] });
      if (r.body.run?.state === "done") break;
      await new Promise((res) => setTimeout(res, 100));
    }
    client.reset();
    if (fairness) {
      process.exitCode = await fairnessScenario(client, cookies, { revisionId, limitSetId });
      return;
    }

    // The load: 3 submitters, 24 dashboard readers, 8 history readers, each with a short pause between requests.
    soakStart = performance.now();
    const end = soakStart + durationMs;
    const over = () => stopping || performance.now() >= end;
    const pause = (ms: number) => new Promise<void>((r) => setTimeout(r, ms * (0.5 + Math.random())));
    let runsDone = 0;
    let trialsDone = 0;
    const progress = setInterval(() => {
      const s = (performance.now() - soakStart) / 1000;
      const last = memory.at(-1);
      console.log(`soak: ${s.toFixed(0)} s, ${client.total()} requests (${client.summary().reduce((n, r) => n + r.failed, 0)} failed), ${runsDone} runs done` +
        (last ? `, server RSS ${mb(last.rss)} MiB heap ${mb(last.heapUsed)} MiB` : ""));
    }, 30_000);
    await Promise.all([
      runLoops(3, async (i) => {
        const trials = 500 + 250 * i;
        const res = await client.send("submit run", "POST", "/api/runs", { cookie: cookies[i], body: { revisionId, limitSetId, trials, seed: Math.floor(Math.random() * 2 ** 31) } });
        if (res.status !== 201) {
          await pause(1000);
          return;
        }
        const id: string = res.body.run.id;
        runIds.push(id);
        while (!over()) {
          const r = await client.send("run dashboard", "GET", `/api/runs/${id}`, { cookie: cookies[i] });
          const state = r.body?.run?.state;
          if (state === "done") {
            runsDone++;
            trialsDone += trials;
            break;
          }
          if (state === "failed" || state === "cancelled") break;
          await pause(250);
        }
      }, over),
      runLoops(24, async (i) => {
        const id = runIds[Math.floor(Math.random() * runIds.length)];
        await client.send("run dashboard", "GET", `/api/runs/${id}`, { cookie: cookies[i % cookies.length] });
        await pause(60);
      }, over),
      runLoops(8, async (i) => {
        const sort = ["queuedAt", "yield"][i % 2];
        const page = 1 + Math.floor(Math.random() * Math.max(1, Math.ceil(runIds.length / 25)));
        await client.send("history", "GET", `/api/runs?designId=${designId}&sort=${sort}&dir=desc&page=${page}&pageSize=25`, { cookie: cookies[i % cookies.length] });
        await pause(120);
      }, over),
    ]);
    clearInterval(progress);
    const seconds = (performance.now() - soakStart) / 1000;

    // Report.
    const rows = client.summary();
    console.log(`\nLotwise soak: ${seconds.toFixed(0)} s of mixed load on loopback (3 submitters, 24 dashboard readers, 8 history readers)\n`);
    console.log(formatSummary(rows, seconds));
    console.log(`\nruns done: ${runsDone} (${trialsDone} trials, ${(trialsDone / seconds).toFixed(0)} trials/s through the queue)`);
    if (client.failures.length) console.log(`failures (last ${client.failures.length}):\n  ${client.failures.join("\n  ")}`);

    const windowMs = Math.min(60_000, durationMs / 3);
    const warmMs = Math.min(20_000, durationMs / 10);
    const first = memory.filter((m) => m.t >= warmMs && m.t < warmMs + windowMs);
    const last = memory.filter((m) => m.t >= seconds * 1000 - windowMs);
    const allowed = 0.2;
    console.log(`\nserver memory (the whole process: main thread, worker threads, buffers), sampled every 2 s; heap after a full GC every 10 s:`);
    const every = Math.max(1, Math.floor(memory.length / 12));
    console.log(memory.filter((_, k) => k % every === 0).map((m) => `  ${(m.t / 1000).toFixed(0).padStart(4)} s  RSS ${mb(m.rss).padStart(7)} MiB  heap ${mb(m.heapUsed).padStart(6)} MiB`).join("\n"));
    let flat = true;
    const measures = [
      { key: "rss" as const, label: "RSS            " },
      { key: "liveHeap" as const, label: "heap after GC  " },
      { key: "heapUsed" as const, label: "heap (sampled) " },
    ];
    for (const { key, label } of measures) {
      const a = mean(first.flatMap((m) => (m[key] === undefined ? [] : [m[key]!])));
      const b = mean(last.flatMap((m) => (m[key] === undefined ? [] : [m[key]!])));
      if (!a || !b) continue;
      const change = (b - a) / a;
      const judged = key !== "heapUsed"; // the sampled heap swings with the collector's saw-tooth; shown only
      const ok = change <= allowed;
      if (judged) flat &&= ok;
      console.log(`  ${label}: first window (${(warmMs / 1000).toFixed(0)}–${((warmMs + windowMs) / 1000).toFixed(0)} s) average ${mb(a)} MiB, ` +
        `last ${(windowMs / 1000).toFixed(0)} s average ${mb(b)} MiB: ${change >= 0 ? "+" : ""}${(100 * change).toFixed(1)} %` +
        (judged ? ` (${ok ? "within" : "over"} +${100 * allowed} %)` : " (not judged)"));
    }
    const failed = rows.reduce((n, r) => n + r.failed, 0);
    console.log(`\nverdict: memory ${flat ? "FLAT" : "GROWING"}; ${failed === 0 ? "no request failed" : `${failed} request(s) failed`}`);
    process.exitCode = flat && failed === 0 ? 0 : 1;
  } finally {
    await stopAll();
  }
}

// ---------------------------------------------------------------- fairness scenario (`npm run soak -- --fairness`)

/** An n-section LC low-pass ladder, 50 ohm: the largest circuit the API takes has 250 sections (500 parts). */
function ladder(sections: number) {
  const parts: { ref: string; kind: "L" | "C"; nodes: [string, string]; value: number; tolerance: number }[] = [];
  for (let k = 0; k < sections; k++) {
    parts.push({ ref: `L${k + 1}`, kind: "L", nodes: [`n${k}`, `n${k + 1}`], value: 80e-9, tolerance: 0.05 });
    parts.push({ ref: `C${k + 1}`, kind: "C", nodes: [`n${k + 1}`, "gnd"], value: 32e-12, tolerance: 0.05 });
  }
  return { name: `ladder of ${sections} sections`, ports: [{ name: "in", node: "n0", z0: 50 }, { name: "out", node: `n${sections}`, z0: 50 }], parts };
}

/**
 * Fair sharing, measured: person B's small run (5,000 trials of the soak low-pass) alone, then while person A's largest
 * allowed run executes (500 parts, 10,001 points, 10 corners, as many trials as the compute limit allows); and
 * /api/health sampled every 50 ms while trial replays and a trials-CSV export of a large finished run are computed.
 * Prints the times side by side and the health latencies; returns the exit code (0 when every request succeeded).
 */
async function fairnessScenario(client: LoadClient, cookies: string[], small: { revisionId: string; limitSetId: string }): Promise<number> {
  const [a, b] = cookies;
  const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));
  const waitState = async (id: string, cookie: string, want: (state: string) => boolean, ms = 900_000) => {
    const until = performance.now() + ms;
    for (;;) {
      const r = await client.send("poll", "GET", `/api/runs/${id}`, { cookie });
      if (want(r.body?.run?.state)) return r.body;
      if (performance.now() > until) throw new Error(`run ${id} still ${r.body?.run?.state}`);
      await sleep(50);
    }
  };
  const smallRun = async (seed: number) => {
    const t = performance.now();
    const r = await client.send("small run", "POST", "/api/runs", { cookie: b, body: { ...small, trials: 5000, seed } });
    await waitState(r.body.run.id, b, (s) => s === "done");
    return (performance.now() - t) / 1000;
  };
  const median = (xs: number[]) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];

  // A's designs: the largest circuit, and a large one with a finished run to replay and export.
  const limits = (await client.send("setup", "GET", "/api/settings/compute-limits", { cookie: a })).body.limits as { maxRunCost: number; maxTrialCost: number };
  console.log(`soak: compute limits ${limits.maxRunCost.toExponential(1)} part evaluations per run, ${limits.maxTrialCost.toExponential(1)} per trial`);
  // The largest allowed run: 500 parts (the API's most) at one corner, as many sweep points as one trial may have.
  const corners = [25];
  const points = Math.min(10001, Math.floor(limits.maxTrialCost / 500) - 2);
  const mk = async (name: string, sections: number) => {
    const d = await client.send("setup", "POST", "/api/designs", { cookie: a, body: { name, netlist: ladder(sections), sweep: { from: 1e6, to: 1e9, points: sections === 250 ? points : 10001, scale: "log" } } });
    const l = await client.send("setup", "POST", `/api/designs/${d.body.design.id}/limit-sets`, { cookie: a, body: { name: "acceptance", limits: { rules: [{ metric: "s21_db", from: 1e6, to: 5e6, min: -3 }] }, lotSize: 1000 } });
    return { revisionId: d.body.revision.id as string, limitSetId: l.body.limitSet.id as string };
  };
  const largest = await mk("Largest allowed circuit", 250);
  const large = await mk("Large circuit for exports", 100);
  // The largest allowed run: ask for a million trials, read the most the compute limit allows from the 400.
  const refused = await client.send("largest run", "POST", "/api/runs", { cookie: a, body: { ...largest, trials: 1_000_000, seed: 5, corners }, expect: [400] });
  const maxTrials = Number(/at most (\d+) trials/.exec(String(refused.body?.error?.fields?.trials))?.[1]);
  if (!(maxTrials >= 1)) throw new Error(`no trial limit in ${JSON.stringify(refused.body)}`);
  const exportRun = await client.send("setup", "POST", "/api/runs", { cookie: a, body: { ...large, trials: 40, seed: 7 } });
  await waitState(exportRun.body.run.id, a, (s) => s === "done");

  const alone = [await smallRun(11), await smallRun(12), await smallRun(13)];
  const big = await client.send("largest run", "POST", "/api/runs", { cookie: a, body: { ...largest, trials: maxTrials, seed: 5, corners } });
  if (big.status !== 201) throw new Error(`the largest allowed run was refused: ${JSON.stringify(big.body)}`);
  await waitState(big.body.run.id, a, (s) => s === "running");
  await sleep(3000); // its chunks are on both threads
  const beside = [await smallRun(21), await smallRun(22), await smallRun(23)];
  const bigNow = (await client.send("poll", "GET", `/api/runs/${big.body.run.id}`, { cookie: a })).body.run;

  // Health while replays and an export compute (the big run still executing on the trial pool).
  const health: number[] = [];
  let sampling = true;
  const sampler = (async () => {
    while (sampling) {
      const t = performance.now();
      await client.send("health", "GET", "/api/health");
      health.push(performance.now() - t);
      await sleep(50);
    }
  })();
  const windowStart = performance.now();
  const replays: number[] = [];
  for (let k = 0; k < 6; k++) {
    const t = performance.now();
    await client.send("replay", "GET", `/api/runs/${exportRun.body.run.id}/trials/${k}`, { cookie: b });
    replays.push(performance.now() - t);
  }
  const tCsv = performance.now();
  const csv = await client.send("export", "GET", `/api/runs/${exportRun.body.run.id}/trials.csv`, { cookie: b });
  const csvSecs = (performance.now() - tCsv) / 1000;
  sampling = false;
  await sampler;
  await sleep(2100); // the report that covers the window's end
  const loopMax = Math.max(0, ...loopDelays.filter((d) => d.t >= windowStart).map((d) => d.maxMs));
  await client.send("cancel", "POST", `/api/runs/${big.body.run.id}/cancel`, { cookie: a });

  const fmt = (xs: number[]) => xs.map((x) => x.toFixed(2)).join(", ");
  console.log(`
Lotwise fairness (2 trial threads, 1 export thread, up to 4 runs at once, one per person):`);
  console.log(`  person B's 5,000-trial run alone:                          ${fmt(alone)} s (median ${median(alone).toFixed(2)} s)`);
  console.log(`  the same beside person A's largest allowed run (${maxTrials} trials × ${corners.length} corner × ${points + 2} points × 500 parts, ${bigNow.trialsDone} done meanwhile):`);
  console.log(`                                                            ${fmt(beside)} s (median ${median(beside).toFixed(2)} s, ${(median(beside) / median(alone)).toFixed(2)}× alone)`);
  console.log(`  /api/health during ${replays.length} replays (${fmt(replays.map((x) => x / 1000))} s) of a 200-part × 10,003-point run and its trials CSV (${csvSecs.toFixed(1)} s, ${String(csv.body).length} bytes):`);
  console.log(`    ${health.length} samples: p50 ${percentile(health, 50).toFixed(1)} ms, p99 ${percentile(health, 99).toFixed(1)} ms, max ${Math.max(...health).toFixed(1)} ms (${health.filter((x) => x > 100).length} over 100 ms)`);
  console.log(`    the server's event loop was held up at most ${loopMax.toFixed(0)} ms meanwhile (monitorEventLoopDelay; the rest of a slow answer is waiting for a core)`);
  const failed = client.summary().reduce((n, r) => n + r.failed, 0);
  if (client.failures.length) console.log(`failures:\n  ${client.failures.join("\n  ")}`);
  return failed === 0 ? 0 : 1;
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const main = process.argv.includes("--serve") ? serve() : soak();
  main.catch((err: Error) => {
    console.error(`soak: ${err.message}${(err as { cause?: Error }).cause ? ` (${String((err as { cause?: Error }).cause?.message ?? (err as { cause?: unknown }).cause)})` : ""}\n${err.stack ?? ""}`);
    process.exit(1);
  });
}
