/**
 * Lotwise engine benchmark (`npm run bench` → tsx scripts/bench.ts).
 *
 * Measured side by side in one run on the same systems:
 *  1. point-solves per second (one point = every S_ij and group delay at one frequency) of
 *     - the compiled solver alone (createSweepEvaluator().evaluate in this thread),
 *     - full Monte Carlo runs (sampling + solve + rules + envelopes) on the worker pool with 1 and 2 workers,
 *     - the plain dense complex Gaussian-elimination baseline tests/oracles/dense-solver.ts (fewer trials, as a rate);
 *     on a 7th-order Butterworth low-pass ladder (10,000 trials × 201 points) and a 5th-order band-pass;
 *  2. peak memory (RSS of the process, which includes the worker threads, and the main heap; sampled
 *     every 20 ms) of a 1,000,000-trial run against a 100,000-trial run, to show it is flat in the trial count;
 *  3. distributed mode: one 30,000-trial run of the low-pass through BullMQ on a private redis-server
 *     (scripts/redis.ts, data in .tmp/redis-bench, a free port) with 1, 2 and 3 worker processes
 *     (workers/queue-worker.ts, 1 trial thread each; fastest of 2 runs), as ratios to 1 process, against the
 *     embedded 1-thread pool (the queue's overhead), and whether all results are byte-identical (toStoredResult).
 *     On a 2-core machine this shows overhead and scaling up to the core count only, not what more hosts would give.
 *  4. the `lotwise` command line's start: `--help` and a small `run` through the bundled CLI (bin/lotwise.js on
 *     dist/cli, scripts/build-cli.mjs) against the same commands run from the TypeScript sources through tsx (as
 *     `node --import tsx server/cli/main.ts`, and for --help also as the `tsx` command, how `npm run lotwise` started
 *     before the bundle), wall-clock per process, median of a few starts, and whether the outputs are identical.
 * Kept under ~6 minutes on 2 cores: the memory runs use a coarser grid (printed).
 * LOTWISE_BENCH_ONLY=distributed runs section 3 alone (a quick check of distributed mode), LOTWISE_BENCH_ONLY=cli
 * section 4 alone.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import os from "node:os";
import { performance } from "node:perf_hooks";
import type { Netlist } from "../shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../shared/engine/solver";
import { buildFrequencyGrid } from "../shared/engine/frequency-grid";
import { synthesizeLadder } from "../shared/engine/synthesis/index";
import { createTrialPool } from "../workers/trial-pool";
import { denseSweep } from "./oracles/dense-solver";
import { Redis } from "ioredis";
import { startRedis, type RedisServer } from "./redis";
import { createDistributedDispatcher, type DistributedDispatcher } from "../server/engine/distributed-dispatcher";
import { toStoredResult } from "../server/services/run-queue";
import { createLogger } from "../server/logger";
import type { RunResult } from "../shared/engine/result";
import { freePort, startWorker, type WorkerProcess } from "./worker-process";

interface System {
  name: string;
  netlist: Netlist;
  limits: { rules: { metric: string; from: number; to: number; min?: number; max?: number }[] };
  sweep: { from: number; to: number; points: number; scale: "log" };
}

const withTolerance = (n: Netlist, tol: number): Netlist => ({ ...n, parts: n.parts.map((p) => ({ ...p, tolerance: tol })) });

const systems: System[] = [
  {
    name: "7th-order Butterworth low-pass, 100 MHz",
    netlist: withTolerance(synthesizeLadder({ family: "butterworth", type: "lowpass", order: 7, cutoff: 100e6 }), 0.05),
    limits: { rules: [{ metric: "s21_db", from: 1e6, to: 70e6, min: -1 }, { metric: "s21_db", from: 200e6, to: 1e9, max: -40 }, { metric: "s11_db", from: 1e6, to: 60e6, max: -15 }] },
    sweep: { from: 1e6, to: 1e9, points: 201, scale: "log" },
  },
  {
    name: "5th-order Butterworth band-pass, 90–110 MHz",
    netlist: withTolerance(synthesizeLadder({ family: "butterworth", type: "bandpass", order: 5, low: 90e6, high: 110e6 }), 0.02),
    limits: { rules: [{ metric: "s21_db", from: 95e6, to: 105e6, min: -1 }, { metric: "s21_db", from: 150e6, to: 1e9, max: -40 }] },
    sweep: { from: 10e6, to: 1e9, points: 201, scale: "log" },
  },
];

const fmtRate = (x: number) => `${(x / 1e6).toFixed(2)} M/s`;
const mb = (x: number) => `${(x / 2 ** 20).toFixed(0)} MB`;

const onlyDistributed = process.env.LOTWISE_BENCH_ONLY === "distributed";
const onlyCli = process.env.LOTWISE_BENCH_ONLY === "cli";

async function main(): Promise<void> {
  const t0 = performance.now();
  const load = os.loadavg().map((x) => x.toFixed(1)).join(" / ");
  console.log(`Lotwise bench — node ${process.version}, ${os.cpus()[0]?.model ?? "cpu"}, ${os.availableParallelism()} cores, load average ${load} (1/5/15 min)`);
  console.log("Rates are point-solves per second: one point = every S_ij and group delay at one frequency of one trial.");
  console.log("Worker scaling is only meaningful when the load average is below the core count.");
  if (onlyCli) {
    benchCliStart();
    return;
  }
  const pool1 = createTrialPool({ size: 1 });
  const pool2 = createTrialPool({ size: 2 });
  try {
    // Warm up every thread of both pools on both systems (thread start, tsx transform, JIT): with one
    // warm-up chunk only one thread of the 2-worker pool would be warm, and its partner would start the
    // timed run cold, which showed up as poor 2-worker scaling. Small chunks so every thread gets some.
    if (!onlyDistributed) {
      for (const sys of systems) {
        await Promise.all([pool1, pool2].map((p) => p.runMonteCarlo(sys.netlist, sys.limits, { trials: 800, seed: 0, sweep: sys.sweep }, { chunkSize: 100 })));
      }
      for (const sys of systems) await benchSystem(sys, pool1, pool2);
      await benchMemory(pool2);
    }
    await benchDistributed(pool1);
    if (!onlyDistributed) benchCliStart();
  } finally {
    await Promise.all([pool1.close(), pool2.close()]);
  }
  console.log(`\ntotal bench time ${((performance.now() - t0) / 1000).toFixed(1)} s, load average now ${os.loadavg()[0].toFixed(1)}`);
}

async function benchSystem(sys: System, pool1: ReturnType<typeof createTrialPool>, pool2: ReturnType<typeof createTrialPool>): Promise<void> {
  const compiled = compileNetlist(sys.netlist);
  const freqs = buildFrequencyGrid(sys.sweep).freqs;
  const F = freqs.length;
  console.log(`\n${sys.name}: ${sys.netlist.parts.length} parts, ${compiled.nodeNames.length} nodes, ${F} points`);

  // 1. compiled solver alone, one thread
  const ev = createSweepEvaluator(compiled, freqs);
  const values = nominalValues(compiled);
  const v = values.slice();
  let sweeps = 0;
  const s0 = performance.now();
  while (performance.now() - s0 < 1500) {
    for (let k = 0; k < 100; k++) {
      v[k % v.length] = values[k % v.length] * (1 + 1e-3 * ((k % 7) - 3));
      ev.evaluate(v, 25);
    }
    sweeps += 100;
  }
  const solverRate = (sweeps * F) / ((performance.now() - s0) / 1000);

  // 2. full Monte Carlo on the pool, 10,000 trials
  const trials = 10_000;
  const mc = async (pool: ReturnType<typeof createTrialPool>) => {
    const t = performance.now();
    const res = await pool.runMonteCarlo(sys.netlist, sys.limits, { trials, seed: 1, sweep: sys.sweep }, { chunkSize: 1000 });
    const gridPoints = res.envelopes.freqs.length;
    return { rate: (trials * gridPoints) / ((performance.now() - t) / 1000), res };
  };
  const one = await mc(pool1);
  const two = await mc(pool2);

  // 3. dense baseline on fewer trials
  let denseSweeps = 0;
  const d0 = performance.now();
  while (performance.now() - d0 < 1500) {
    denseSweep(sys.netlist, freqs, 25, v);
    denseSweeps++;
  }
  const denseRate = (denseSweeps * F) / ((performance.now() - d0) / 1000);

  console.log(`  compiled solver alone, 1 thread        ${fmtRate(solverRate).padStart(11)}  (${(solverRate / denseRate).toFixed(1)}× dense)`);
  console.log(`  Monte Carlo ${trials} trials, 1 worker   ${fmtRate(one.rate).padStart(11)}  (${(one.rate / denseRate).toFixed(1)}× dense)  yield ${(100 * one.res.yield).toFixed(2)} %`);
  console.log(`  Monte Carlo ${trials} trials, 2 workers  ${fmtRate(two.rate).padStart(11)}  (${(two.rate / denseRate).toFixed(1)}× dense, ${(two.rate / one.rate).toFixed(2)}× 1 worker)`);
  console.log(`  dense baseline (${denseSweeps} sweeps)          ${fmtRate(denseRate).padStart(11)}`);
  console.log(`  same result with 1 and 2 workers: ${JSON.stringify(one.res) === JSON.stringify(two.res) ? "yes" : "NO"}`);
}

async function benchMemory(pool: ReturnType<typeof createTrialPool>): Promise<void> {
  const sys = systems[0];
  const sweep = { ...sys.sweep, points: 21 };
  console.log(`\nPeak memory, ${sys.name}, ${sweep.points}-point grid (coarser than 201 to keep 1,000,000 trials within the time budget on 2 cores), 2 workers:`);
  for (const trials of [100_000, 1_000_000]) {
    global.gc?.();
    let rss = 0;
    let heap = 0;
    const sample = () => {
      const m = process.memoryUsage();
      rss = Math.max(rss, m.rss);
      heap = Math.max(heap, m.heapUsed);
    };
    const timer = setInterval(sample, 20);
    const t = performance.now();
    const res = await pool.runMonteCarlo(sys.netlist, sys.limits, { trials, seed: 9, sweep }, { chunkSize: 5000 });
    clearInterval(timer);
    sample();
    const secs = (performance.now() - t) / 1000;
    console.log(`  ${String(trials).padStart(9)} trials: peak RSS ${mb(rss).padStart(7)}, peak main heap ${mb(heap).padStart(7)}, ${secs.toFixed(1)} s (${fmtRate((trials * res.envelopes.freqs.length) / secs)}), yield ${(100 * res.yield).toFixed(3)} %`);
  }
}

/**
 * Distributed mode on this machine: the same run through BullMQ with 1, 2 and 3 worker processes (1 trial thread
 * each, started one by one between the measurements), and on the embedded 1-thread pool for reference.
 * Every worker is warmed (thread start, tsx transform, JIT) before it is timed; each figure is the fastest of 2 runs. Redis and the workers are stopped
 * at the end, also on an error; the data folder is removed before and after.
 */
async function benchDistributed(pool1: ReturnType<typeof createTrialPool>): Promise<void> {
  const sys = systems[0];
  const trials = 30_000;
  const chunkSize = 2500; // 12 chunks: an even share for 1, 2 and 3 processes
  const options = { trials, seed: 3, sweep: sys.sweep };
  const dir = ".tmp/redis-bench";
  const REPEATS = 2;
  const load = os.loadavg()[0].toFixed(1);
  rmSync(dir, { recursive: true, force: true });
  let redis: RedisServer | null = null;
  let dispatcher: DistributedDispatcher | null = null;
  const workers: WorkerProcess[] = [];
  try {
    redis = await startRedis({ dir, port: await freePort() });
    dispatcher = createDistributedDispatcher({ redisUrl: redis.url, pollMs: 100, log: createLogger("warn") });
    const d = dispatcher;
    const url = redis.url;
    /** The fastest of `REPEATS` runs (other work on a shared machine makes a single run noisy); every result is kept. */
    const results: RunResult[] = [];
    const timed = async (run: () => Promise<RunResult>) => {
      let secs = Infinity;
      for (let k = 0; k < REPEATS; k++) {
        const t = performance.now();
        results.push(await run());
        secs = Math.min(secs, (performance.now() - t) / 1000);
      }
      return { secs, res: results[results.length - 1] };
    };
    /** Starts one more worker process and warms it: small runs until it has done 2 chunks (at most 4 tries). */
    const addWorker = async () => {
      // Default lock settings (the test helper's short ones are for fault tests); its output is kept, not printed.
      const w = await startWorker(url, `bench-${workers.length + 1}`, { threads: 1, env: { LOTWISE_CHUNK_LOCK_MS: "10000", LOTWISE_STALLED_CHECK_MS: "5000" } });
      workers.push(w);
      for (let k = 0; k < 4 && w.chunksDone().length < 2; k++) {
        await d.runMonteCarlo(sys.netlist, sys.limits, { trials: 2000, seed: 100 + k, sweep: sys.sweep }, { chunkSize: 250 });
      }
    };

    await pool1.runMonteCarlo(sys.netlist, sys.limits, { trials: 2000, seed: 100, sweep: sys.sweep }, { chunkSize: 250 });
    const embedded = await timed(() => pool1.runMonteCarlo(sys.netlist, sys.limits, options, { chunkSize }));
    const rows: { processes: number; secs: number; res: RunResult }[] = [];
    for (let n = 1; n <= 3; n++) {
      await addWorker();
      rows.push({ processes: n, ...(await timed(() => d.runMonteCarlo(sys.netlist, sys.limits, options, { chunkSize }))) });
    }

    const points = trials * embedded.res.envelopes.freqs.length;
    const rate = (secs: number) => `${(points / secs / 1e6).toFixed(2)} M point-solves/s`;
    const stored = (r: RunResult) => JSON.stringify(toStoredResult(r));
    const reference = stored(embedded.res);
    const same = results.every((r) => stored(r) === reference);
    console.log(`\nDistributed mode (BullMQ on a local redis-server, worker processes with 1 thread each), ${sys.name}, ${trials.toLocaleString("en-US")} trials × ${embedded.res.envelopes.freqs.length} points, chunks of ${chunkSize}, fastest of ${REPEATS} runs, load average ${load}:`);
    const overhead = 100 * (rows[0].secs / embedded.secs - 1);
    for (const r of rows) {
      console.log(`  ${`${r.processes} worker process${r.processes > 1 ? "es" : ""}`.padEnd(24)}${r.secs.toFixed(2).padStart(6)} s  ${rate(r.secs).padStart(24)}  ${(rows[0].secs / r.secs).toFixed(2)}× 1 process`);
    }
    console.log(`  ${"embedded pool, 1 thread".padEnd(24)}${embedded.secs.toFixed(2).padStart(6)} s  ${rate(embedded.secs).padStart(24)}  1 process / embedded ${(embedded.secs / rows[0].secs).toFixed(2)}× (the queue's overhead: time ${overhead >= 0 ? "+" : "−"}${Math.abs(overhead).toFixed(0)} %)`);
    console.log(`  same result (stored JSON) in all ${results.length} runs, 1, 2, 3 processes and embedded: ${same ? "yes" : "NO"}; yield ${(100 * embedded.res.yield).toFixed(2)} %`);
    const info = new Redis(url);
    try {
      const mem = await info.info("memory");
      const field = (name: string) => Number(new RegExp(`^${name}:(\\d+)`, "m").exec(mem)?.[1]);
      const keys = await info.dbsize();
      console.log(`  Redis: peak memory ${(field("used_memory_peak") / 2 ** 20).toFixed(1)} MiB during these runs, ${(field("used_memory") / 2 ** 20).toFixed(1)} MiB and ${keys} keys after them (finished batches removed)`);
    } finally {
      info.disconnect();
    }
    const cores = os.availableParallelism();
    console.log(`  Note: this machine has ${cores} core${cores === 1 ? "" : "s"}, shared by this process (dispatcher and merging), Redis and the workers, so more than ${cores} worker process${cores === 1 ? "" : "es"} cannot run faster here;`);
    console.log("  the ratios show the queue's overhead and scaling up to the core count, not what worker processes on more hosts would give.");
  } finally {
    await Promise.allSettled(workers.map(stopWorker));
    await dispatcher?.close().catch(() => undefined);
    await redis?.stop().catch(() => undefined);
    rmSync(dir, { recursive: true, force: true });
  }
}

/**
 * SIGTERM (the worker finishes running chunks and exits), SIGKILL after 15 s. Not the helper's stop(): its 15 s
 * timer stays pending after the exit and would hold this process open that long at the end of the bench.
 */
/**
 * Section 4: wall-clock time of whole `lotwise` processes, bundled against tsx. Each start is a fresh process (no
 * warm module cache but the operating system's file cache); the bundle is brought up to date before timing, so the
 * bundled figures include the shim's staleness check but not a build.
 */
function benchCliStart(): void {
  const root = join(import.meta.dirname, "..");
  console.log("\n4. lotwise CLI start (wall clock of one process, median of the starts shown; 'same' = identical stdout)");
  const built = spawnSync(process.execPath, [join(root, "scripts/build-cli.mjs")], { cwd: root, encoding: "utf8" });
  if (built.status !== 0) {
    console.log(`   the CLI bundle did not build: ${built.stderr.trim().split("\n").slice(-3).join(" / ")}`);
    return;
  }
  const dir = mkdtempSync(join(os.tmpdir(), "lotwise-bench-cli-"));
  try {
    const net = join(dir, "net.json");
    const lim = join(dir, "lim.json");
    writeFileSync(net, JSON.stringify(withTolerance(synthesizeLadder({ family: "butterworth", type: "lowpass", order: 3, cutoff: 100e6 }), 0.05)));
    writeFileSync(lim, JSON.stringify({ rules: [{ metric: "s21_db", from: 1e6, to: 70e6, min: -0.8 }, { metric: "s21_db", from: 200e6, to: 1e9, max: -17.5 }] }));
    const ways: { name: string; argv: string[]; starts: number; helpOnly?: boolean }[] = [
      { name: "bundled (bin/lotwise.js)", argv: [process.execPath, join(root, "bin/lotwise.js")], starts: 7 },
      { name: "tsx (node --import tsx server/cli/main.ts)", argv: [process.execPath, "--import", "tsx", join(root, "server/cli/main.ts")], starts: 3 },
      { name: "tsx command (tsx server/cli/main.ts)", argv: [join(root, "node_modules/.bin/tsx"), join(root, "server/cli/main.ts")], starts: 3, helpOnly: true },
    ];
    const commands: { name: string; args: string[] }[] = [
      { name: "--help", args: ["--help"] },
      { name: "run, 300 trials, 1 worker", args: ["run", net, "--limits", lim, "--trials", "300", "--seed", "7", "--workers", "1", "--json"] },
    ];
    const bare: number[] = [];
    for (let i = 0; i < 5; i++) {
      const t0 = performance.now();
      spawnSync(process.execPath, ["-e", "0"], { cwd: root });
      bare.push(performance.now() - t0);
    }
    bare.sort((a, b) => a - b);
    console.log(`   ${"(Node alone: node -e 0)".padEnd(71)} ${(bare[2] / 1000).toFixed(3)} s (min ${(bare[0] / 1000).toFixed(3)}, 5 starts)`);
    for (const command of commands) {
      let reference: string | undefined;
      for (const way of ways) {
        if (way.helpOnly && command.name !== "--help") continue; // keeps the section near 30 s
        const times: number[] = [];
        let same = true;
        for (let i = 0; i < way.starts; i++) {
          const t0 = performance.now();
          const r = spawnSync(way.argv[0], [...way.argv.slice(1), ...command.args], { cwd: root, encoding: "utf8" });
          times.push(performance.now() - t0);
          if (r.status !== 0) throw new Error(`${way.name} ${command.name} exited ${r.status}: ${r.stderr}`);
          reference ??= r.stdout;
          same &&= r.stdout === reference;
        }
        times.sort((a, b) => a - b);
        const median = times[Math.floor(times.length / 2)];
        console.log(`   ${command.name.padEnd(26)} ${way.name.padEnd(44)} ${(median / 1000).toFixed(3)} s (min ${(times[0] / 1000).toFixed(3)}, ${way.starts} starts)${same ? ", same" : ", OUTPUT DIFFERS"}`);
      }
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

async function stopWorker(w: WorkerProcess): Promise<void> {
  if (w.child.exitCode !== null || w.child.signalCode !== null) return;
  w.child.kill("SIGTERM");
  const timer = setTimeout(() => w.child.kill("SIGKILL"), 15_000);
  await w.exited;
  clearTimeout(timer);
}

main().catch((err: unknown) => {
  console.error(`bench failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 1;
});
