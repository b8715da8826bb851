import { describe, expect, it } from "vitest";
import jstatModule from "jstat";
import { decodeAggregate, encodeAggregate, mergeAggregates } from "../../../shared/engine/aggregate";
import { EngineError } from "../../../shared/engine/errors";
import { replayTrial, runMonteCarlo, runTrialChunk } from "../../../shared/engine/monte-carlo";
import type { Netlist } from "../../../shared/engine/netlist";
import { finalizeRun } from "../../../shared/engine/result";
import { createTrialStream } from "../../../shared/engine/random";
import { compileSampling, sampleTrial } from "../../../shared/engine/sampling";
import { clopperPearsonInterval } from "../../../shared/engine/stats/intervals";
import { butterLimits, butterworth3 } from "../../fixtures/butterworth3";

const jStat = ((jstatModule as unknown as { jStat?: unknown }).jStat ?? jstatModule) as { normal: { cdf(x: number, m: number, s: number): number } };

/** A series resistor R between two 50-ohm ports: S21 = 2·z0/(2·z0 + R) (real, frequency-independent). */
function seriesR(tolerance: number, extra: Partial<Netlist["parts"][number]> = {}): Netlist {
  return {
    ports: [{ name: "in", node: "a", z0: 50 }, { name: "out", node: "b", z0: 50 }],
    parts: [{ ref: "R1", kind: "R", nodes: ["a", "b"], value: 10, tolerance, ...extra }],
  };
}


describe("Monte Carlo yield with an analytic answer", () => {
  it("series R, 10 % normal (3σ, truncated): yield = P(R ≤ 10.5 Ω) within its 99 % interval", async () => {
    // |S21| dB = 20·log10(100/(100 + R)) falls with R, so "s21_db ≥ 20·log10(100/110.5)" passes iff R ≤ 10.5 Ω.
    // R = 10·(1 + 0.1·z/3), z ~ N(0,1) truncated to |z| ≤ 3  ⇒  R ≤ 10.5 ⇔ z ≤ 1.5.
    // [C] p = (Φ(1.5) − Φ(−3)) / (Φ(3) − Φ(−3)) with jstat's Φ (≈ 0.9344; tests/fixtures/generators/closed_form_values.py)
    const p = (jStat.normal.cdf(1.5, 0, 1) - jStat.normal.cdf(-3, 0, 1)) / (jStat.normal.cdf(3, 0, 1) - jStat.normal.cdf(-3, 0, 1));
    const limit = 20 * Math.log10(100 / 110.5);
    const res = await runMonteCarlo(seriesR(0.1), { rules: [{ metric: "s21_db", from: 1e6, to: 1e7, min: limit }] }, { trials: 4000, seed: 2024, sweep: { from: 1e6, to: 1e7, points: 5 } });
    const [lo, hi] = clopperPearsonInterval(res.passed, res.trials, 0.99);
    expect(p).toBeGreaterThan(lo);
    expect(p).toBeLessThan(hi);
    expect(res.wilson95[0]).toBeLessThan(res.yield);
    expect(res.ruleFailures[0]).toBe(res.trials - res.passed);
  });

  it("margins, Cpk and nominal margin of the series R case", async () => {
    // nominal margin = 20·log10(100/110) − 20·log10(100/110.5) [C] = 0.0394 dB
    const limit = 20 * Math.log10(100 / 110.5);
    const res = await runMonteCarlo(seriesR(0.1), { rules: [{ metric: "s21_db", from: 1e6, to: 1e7, min: limit }] }, { trials: 2000, seed: 5, sweep: { from: 1e6, to: 1e7, points: 3 } });
    const rule = res.rules[0];
    expect(rule.nominalMargin).toBeCloseTo(20 * Math.log10(110.5 / 110), 12);
    expect(rule.cpk).toBeCloseTo((rule.marginMean as number) / (3 * (rule.marginStd as number)), 12);
    const h = rule.histogram;
    expect(h.counts.reduce((s, c) => s + c, 0) + h.underflow + h.overflow).toBe(2000);
    // the margin falls with R: its rank correlation with R's deviation is −1 (monotone map)
    expect(res.sensitivity.rho[0][0]).toBeCloseTo(-1, 12);
    // the S21 envelope: median ≈ nominal, within one bin width plus sampling spread
    const s21 = res.envelopes.series.find((s) => s.metric === "s21_db")!;
    expect(Math.abs((s21.values[2][0] as number) - s21.nominal[0])).toBeLessThan(0.02);
    expect(s21.values[0][0]!).toBeLessThan(s21.values[4][0]!);
  });
});

describe("streaming percentile envelopes", () => {
  it("match the exact quantiles of the same samples within one bin", async () => {
    // [C] The series-R case has |S21| dB = 20·log10(100/(100 + R)) exactly, so the test recomputes the
    // response of every trial from its sampled R (same seeded streams) and takes exact order statistics.
    const n = 3000;
    const binDb = 0.002;
    const net = seriesR(0.1);
    const limits = { rules: [{ metric: "s21_db", from: 1e6, to: 1e7, min: -3 }] };
    const res = await runMonteCarlo(net, limits, { trials: n, seed: "env", sweep: { from: 1e6, to: 1e7, points: 2 }, envelopeBinDb: binDb, envelopeSpanDb: 1 }, { chunkSize: 700 });
    const plan = compileSampling(net);
    const v = new Float64Array(1);
    const db: number[] = [];
    for (let t = 0; t < n; t++) {
      sampleTrial(plan, createTrialStream("env", t), v);
      db.push(20 * Math.log10(100 / (100 + v[0])));
    }
    db.sort((a, b) => a - b);
    const s21 = res.envelopes.series.find((s) => s.metric === "s21_db")!;
    res.envelopes.percentiles.forEach((pct, q) => {
      const exact = db[Math.min(n - 1, Math.floor((pct / 100) * n))];
      expect(Math.abs((s21.values[q][0] as number) - exact)).toBeLessThanOrEqual(binDb);
    });
    expect(s21.clipped).toBe(0);
    expect(res.envelopes.binDb).toBeCloseTo(binDb, 15);
  });
});

describe("rules on a ladder, corners and replay", () => {
  it("a failing trial replays to the same margins, and a trial passes only if it passes at every corner", async () => {
    const res = await runMonteCarlo(butterworth3(), butterLimits, { trials: 600, seed: "replay", corners: [-40, 25, 125] });
    expect(res.failingTrials.length).toBeGreaterThan(0);
    const idx = res.failingTrials[0];
    const rp = replayTrial(butterworth3(), butterLimits, { corners: [-40, 25, 125] }, "replay", idx);
    expect(rp.pass).toBe(false);
    expect(rp.margins.some((m) => m < 0)).toBe(true);
    for (let r = 0; r < rp.margins.length; r++) expect(rp.margins[r]).toBe(Math.min(...rp.corners.map((c) => c.margins[r])));
    expect(rp.corners[0].sDb.s21_db.length).toBe(rp.freqs.length);
    // A run at 25 °C only cannot have more failures than the run over three corners (same samples).
    const only25 = await runMonteCarlo(butterworth3(), butterLimits, { trials: 600, seed: "replay" });
    expect(only25.passed).toBeGreaterThanOrEqual(res.passed);
    // the first passing index of the 3-corner run that is not listed as failing replays as a pass
    const firstPass = Array.from({ length: 600 }, (_, k) => k).find((k) => !res.failingTrials.includes(k) && k < res.failingTrials[res.failingTrials.length - 1])!;
    expect(replayTrial(butterworth3(), butterLimits, { corners: [-40, 25, 125] }, "replay", firstPass).pass).toBe(true);
  });

  it("ripple margin is max − peak-to-peak of |S21| over the band", () => {
    const agg = runTrialChunk({ netlist: butterworth3(0), limits: { rules: [{ metric: "ripple_db", from: 1e6, to: 70e6, max: 1 }] }, options: { trials: 1, seed: 1 }, start: 0, count: 1 });
    // [C] Butterworth n = 3: IL = 10·log10(1 + (f/fc)^6) (docs/references.md §2), monotone; pp = IL(70 MHz) − IL(1 MHz)
    const pp = 10 * Math.log10(1 + 0.7 ** 6) - 10 * Math.log10(1 + 0.01 ** 6);
    expect(agg.meta.nominalMargins[0]).toBeCloseTo(1 - pp, 3); // element values are given to 5 digits
  });
});

describe("aggregates", () => {
  const task = { netlist: butterworth3(), limits: butterLimits, options: { trials: 300, seed: 3 } };

  it("merge is exact and order-independent; encode/decode round-trips", () => {
    const whole = runTrialChunk({ ...task, start: 0, count: 300 });
    const a = runTrialChunk({ ...task, start: 0, count: 120 });
    const b = runTrialChunk({ ...task, start: 120, count: 100 });
    const c = runTrialChunk({ ...task, start: 220, count: 80 });
    const abc = mergeAggregates(mergeAggregates(a, b), c);
    const cba = mergeAggregates(c, mergeAggregates(b, decodeAggregate(encodeAggregate(a))));
    const j = (x: unknown) => JSON.stringify(x);
    expect(j(finalizeRun(abc))).toBe(j(finalizeRun(whole)));
    expect(j(finalizeRun(cba))).toBe(j(finalizeRun(whole)));
    expect(() => mergeAggregates(a, a)).toThrow(/overlap/);
  });

  it("validates chunk payloads on entry", () => {
    expect(() => runTrialChunk({ ...task, start: 250, count: 100 })).toThrow(/start \+ count ≤ trials/);
    expect(() => runTrialChunk({ ...task, options: { trials: 0, seed: 3 }, start: 0, count: 1 })).toThrow(/`trials` must be an integer/);
    expect(() => runTrialChunk({ ...task, limits: { rules: [{ metric: "s21_db", from: 5, to: 1, min: 0 }] }, start: 0, count: 1 })).toThrow(EngineError);
    try {
      runTrialChunk({ ...task, netlist: { ...butterworth3(), parts: [{ ...butterworth3().parts[0], value: -1 }] }, start: 0, count: 1 });
      expect.unreachable();
    } catch (err) {
      expect((err as EngineError).code).toBe("INVALID_NETLIST");
    }
  });

  it("cancellation stops a chunk with CANCELLED", () => {
    try {
      runTrialChunk({ ...task, start: 0, count: 10 }, { aborted: true });
      expect.unreachable();
    } catch (err) {
      expect((err as EngineError).code).toBe("CANCELLED");
    }
  });
});
