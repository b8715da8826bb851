import { afterAll, describe, expect, it } from "vitest";
import { EngineError } from "../../../shared/engine/errors";
import { runMonteCarlo } from "../../../shared/engine/monte-carlo";
import { createTrialPool } from "../../../workers/trial-pool";
import { butterLimits, butterworth3 } from "../../fixtures/butterworth3";


const json = (x: unknown) => JSON.stringify(x);
const pool2 = createTrialPool({ size: 2, chunkSize: 300 });
const pool1 = createTrialPool({ size: 1, chunkSize: 1000 });
afterAll(async () => {
  await Promise.all([pool1.close(), pool2.close()]);
});

describe("trial pool", () => {
  it("1 and 2 workers and different chunk sizes give the same result as the in-process run", async () => {
    const opts = { trials: 2000, seed: 11, corners: [25, 85] };
    const [one, two, local] = await Promise.all([
      pool1.runMonteCarlo(butterworth3(), butterLimits, opts),
      pool2.runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 217 }),
      runMonteCarlo(butterworth3(), butterLimits, opts),
    ]);
    expect(json(two)).toBe(json(one));
    expect(json(local)).toBe(json(one));
  });

  it("a worker task that throws fails its run with the coded error, and the pool serves the next run", async () => {
    const bad = { ...butterworth3(), parts: [...butterworth3().parts, { ref: "C1", kind: "C" as const, nodes: ["n1", "gnd"] as [string, string], value: 1e-12 }] };
    // Straight to a worker (bypassing the pool's own up-front check) so the error crosses the thread boundary.
    const err = await pool2.runChunk({ netlist: bad, limits: butterLimits, options: { trials: 10, seed: 1 }, start: 0, count: 10 }).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(EngineError);
    expect((err as EngineError).code).toBe("INVALID_NETLIST");
    expect((err as EngineError).message).toMatch(/C1/);
    const badLimits = await pool2.runChunk({ netlist: butterworth3(), limits: { rules: [{ metric: "s21_db", from: 2e6, to: 1e6, min: -1 }] }, options: { trials: 10, seed: 1 }, start: 0, count: 10 }).catch((e: unknown) => e);
    expect((badLimits as EngineError).code).toBe("INVALID_LIMITS");
    expect((badLimits as EngineError).path).toBe("rules[0].to");
    const rejected = await pool2.runMonteCarlo(bad, butterLimits, { trials: 10, seed: 1 }).catch((e: unknown) => e);
    expect((rejected as EngineError).code).toBe("INVALID_NETLIST");
    const ok = await pool2.runMonteCarlo(butterworth3(), butterLimits, { trials: 600, seed: 1 });
    expect(ok.trials).toBe(600);
  });

  it("an AbortSignal cancels a run with CANCELLED and the pool keeps serving", async () => {
    const ctrl = new AbortController();
    const running = pool2.runMonteCarlo(butterworth3(), butterLimits, { trials: 200_000, seed: 2 }, { signal: ctrl.signal, onProgress: () => ctrl.abort() });
    const err = await running.catch((e: unknown) => e);
    expect((err as EngineError).code).toBe("CANCELLED");
    const ok = await pool2.runMonteCarlo(butterworth3(), butterLimits, { trials: 300, seed: 2 });
    expect(ok.trials).toBe(300);
  });
});
