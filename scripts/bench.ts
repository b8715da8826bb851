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
 *     every 20 ms) of a 1,000,000-trial run against a 100,000-trial run, to show it is flat in the trial count.
 * Kept under ~5 minutes on 2 cores: the memory runs use a coarser grid (printed).
 */
import os from "node:os";
import { performance } from "node:perf_hooks";
import type { Netlist } from "../shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../shared/engine/solver";
import { buildFrequencyGrid } from "../shared/engine/frequency-grid";
import { synthesizeLadder } from "../shared/engine/synthesis/index";
import { createTrialPool } from "../server/engine/trial-pool";
import { denseSweep } from "../tests/oracles/dense-solver";

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

async function main(): Promise<void> {
  const t0 = performance.now();
  const load = os.loadavg().map((x) => x.toFixed(1)).join(" / ");
  console.log(`Lotwise bench — node ${process.version}, ${os.cpus()[0]?.model ?? "cpu"}, ${os.availableParallelism()} cores, load average ${load} (1/5/15 min)`);
  console.log("Rates are point-solves per second: one point = every S_ij and group delay at one frequency of one trial.");
  console.log("Worker scaling is only meaningful when the load average is below the core count.");
  const pool1 = createTrialPool({ size: 1 });
  const pool2 = createTrialPool({ size: 2 });
  try {
    // Warm up every thread of both pools on both systems (thread start, tsx transform, JIT): with one
    // warm-up chunk only one thread of the 2-worker pool would be warm, and its partner would start the
    // timed run cold, which showed up as poor 2-worker scaling. Small chunks so every thread gets some.
    for (const sys of systems) {
      await Promise.all([pool1, pool2].map((p) => p.runMonteCarlo(sys.netlist, sys.limits, { trials: 800, seed: 0, sweep: sys.sweep }, { chunkSize: 100 })));
    }
    for (const sys of systems) await benchSystem(sys, pool1, pool2);
    await benchMemory(pool2);
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

main().catch((err: unknown) => {
  console.error(`bench failed: ${err instanceof Error ? err.message : String(err)}`);
  process.exitCode = 1;
});
