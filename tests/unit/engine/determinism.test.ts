import { describe, expect, it } from "vitest";
import { createAggregate, mergeInto } from "../../../shared/engine/aggregate";
import { evaluateTrials, runMonteCarlo } from "../../../shared/engine/monte-carlo";
import { planRun } from "../../../shared/engine/run-plan";
import { wilsonHalfWidth } from "../../../shared/engine/stats/intervals";
import { butterLimits, butterworth3 } from "../../fixtures/butterworth3";


const json = (x: unknown) => JSON.stringify(x);

describe("determinism (in-process)", () => {
  it("the same seed gives byte-identical results for any chunk size; another seed gives another sample", async () => {
    const opts = { trials: 1200, seed: 77 };
    const a = await runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 1200 });
    const b = await runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 97 });
    const c = await runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 500 });
    expect(json(b)).toBe(json(a));
    expect(json(c)).toBe(json(a));
    const d = await runMonteCarlo(butterworth3(), butterLimits, { ...opts, seed: 78 });
    expect(json(d.rules.map((r) => r.marginMean))).not.toBe(json(a.rules.map((r) => r.marginMean)));
  });

  it("the merged aggregate itself serializes byte-identically for any chunking and merge order", () => {
    const plan = planRun(butterworth3(), butterLimits, { trials: 900, seed: "agg" });
    const run = (chunks: [number, number][]) => {
      const total = createAggregate(plan);
      for (const [s, c] of chunks) mergeInto(total, evaluateTrials(plan, s, c));
      return JSON.stringify(total, (_, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
    };
    const one = run([[0, 900]]);
    expect(run([[0, 300], [300, 300], [600, 300]])).toBe(one);
    expect(run([[600, 300], [0, 450], [450, 150]])).toBe(one);
    expect(run([[0, 899], [899, 1]])).toBe(one);
  });

  it("stop when sure stops at a deterministic batch boundary that meets the half-width", async () => {
    const target = 0.004;
    const opts = { trials: 40_000, seed: "sure", targetHalfWidth: target, batchSize: 250 };
    const a = await runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 250 });
    const b = await runMonteCarlo(butterworth3(), butterLimits, opts, { chunkSize: 73 });
    expect(b.trials).toBe(a.trials);
    expect(json(b)).toBe(json(a));
    expect(a.trials % 250).toBe(0);
    expect(a.trials).toBeLessThan(40_000);
    expect(a.trials).toBeGreaterThan(250);
    expect(a.stop.stoppedEarly).toBe(true);
    expect(a.halfWidth95).toBeLessThanOrEqual(target);
    // one batch earlier the target was not met (trials 0..n−251 are the same trials in a shorter run)
    const earlier = await runMonteCarlo(butterworth3(), butterLimits, { trials: a.trials - 250, seed: "sure" });
    expect(wilsonHalfWidth(earlier.passed, earlier.trials)).toBeGreaterThan(target);
  });
});
