import { describe, expect, it } from "vitest";
import jstatModule from "jstat";
import type { Netlist, Part } from "../../../shared/engine/netlist";
import { createTrialStream, validateSeed } from "../../../shared/engine/random";
import { compileSampling, sampleTrial } from "../../../shared/engine/sampling";
import { normalQuantileFast } from "../../../shared/engine/stats/normal";

const jStat = ((jstatModule as unknown as { jStat?: unknown }).jStat ?? jstatModule) as {
  normal: { inv(p: number, m: number, s: number): number; cdf(x: number, m: number, s: number): number; pdf(x: number, m: number, s: number): number };
};

function netOf(parts: Partial<Part>[]): Netlist {
  return {
    ports: [{ name: "in", node: "a", z0: 50 }, { name: "out", node: "b", z0: 50 }],
    parts: parts.map((p, k) => ({ ref: `X${k}`, kind: "C", nodes: ["a", "b"], value: 1e-9, ...p }) as Part),
  };
}

/** Relative deviations of every part over n trials (column-major per part). */
function draw(net: Netlist, n: number, seed: number | string = 1, options = {}): Float64Array[] {
  const plan = compileSampling(net, options);
  const values = new Float64Array(plan.partCount);
  const dev = new Float64Array(plan.partCount);
  const cols = Array.from({ length: plan.partCount }, () => new Float64Array(n));
  for (let t = 0; t < n; t++) {
    sampleTrial(plan, createTrialStream(seed, t), values, dev);
    for (let p = 0; p < plan.partCount; p++) cols[p][t] = dev[p];
  }
  return cols;
}

const mean = (x: Float64Array) => x.reduce((s, v) => s + v, 0) / x.length;
const sd = (x: Float64Array) => {
  const m = mean(x);
  return Math.sqrt(x.reduce((s, v) => s + (v - m) ** 2, 0) / (x.length - 1));
};
const corr = (x: Float64Array, y: Float64Array) => {
  const mx = mean(x), my = mean(y);
  let sxy = 0, sxx = 0, syy = 0;
  for (let k = 0; k < x.length; k++) {
    sxy += (x[k] - mx) * (y[k] - my);
    sxx += (x[k] - mx) ** 2;
    syy += (y[k] - my) ** 2;
  }
  return sxy / Math.sqrt(sxx * syy);
};

describe("tolerance sampling", () => {
  const N = 100_000;

  it("normal tolerance = 3σ truncated at ±tolerance has σ_trunc = σ·√(1 − 2·3·φ(3)/(2Φ(3) − 1))", () => {
    // [C] variance of N(0,1) truncated to [−a, a]: 1 − 2aφ(a)/(2Φ(a) − 1) (standard truncated-normal moment),
    // evaluated with jstat: ≈ 0.9866 for a = 3
    const a = 3;
    const ratio = Math.sqrt(1 - (2 * a * jStat.normal.pdf(a, 0, 1)) / (2 * jStat.normal.cdf(a, 0, 1) - 1));
    expect(ratio).toBeGreaterThan(0.98);
    expect(ratio).toBeLessThan(0.99);
    const [x] = draw(netOf([{ tolerance: 0.03 }]), N);
    const sigma = 0.03 / 3;
    // standard error of a sample sd ≈ σ/√(2N) = 0.22 % at N = 1e5; allow 3 SE
    expect(Math.abs(sd(x) / (sigma * ratio) - 1)).toBeLessThan(0.0067);
    expect(Math.abs(mean(x))).toBeLessThan((4 * sigma) / Math.sqrt(N));
    expect(Math.max(...x.map(Math.abs))).toBeLessThanOrEqual(0.03 + 1e-15);
    // most extreme draws reach close to the truncation point (P(|z| > 2.9) ≈ 1e-3 per draw)
    expect(Math.max(...x.map(Math.abs))).toBeGreaterThan(0.029);
  });

  it("uniform tolerance has variance tol²/3 and stays within ±tol", () => {
    // [C] variance of U(−t, t) = t²/3
    const [x] = draw(netOf([{ tolerance: 0.05, distribution: "uniform" }]), N);
    const expected = 0.05 / Math.sqrt(3);
    expect(Math.abs(sd(x) / expected - 1)).toBeLessThan(0.006); // SE of sd for a uniform ≈ 0.16 %
    expect(Math.max(...x.map(Math.abs))).toBeLessThanOrEqual(0.05);
  });

  it("absolute tolerances: ±0.25 pF on 2 pF", () => {
    // IEC 60062 letter C = ±0.25 pF (docs/references.md §7)
    const net = netOf([{ value: 2e-12, toleranceAbs: 0.25e-12, tolerance: 0.5 }]);
    const [x] = draw(net, 20_000);
    const absDev = x.map((d) => d * 2e-12);
    expect(Math.max(...absDev.map(Math.abs))).toBeLessThanOrEqual(0.25e-12 * (1 + 1e-12));
    expect(Math.abs(sd(absDev) / ((0.25e-12 / 3) * 0.9866) - 1)).toBeLessThan(0.02); // 0.9866 from the σ_trunc test above
  });

  it("parts of one lot are correlated ≈ ρ, parts of different lots ≈ 0", () => {
    const net = netOf([{ tolerance: 0.05, lot: "A" }, { tolerance: 0.05, lot: "A" }, { tolerance: 0.05, lot: "B" }, { tolerance: 0.05, distribution: "uniform", lot: "A" }]);
    const [a1, a2, b, au] = draw(net, 20_000, "lots");
    // ρ is the model's pairwise correlation (sampling.ts); clipping at ±tol moves it by < 0.01; SE ≈ (1−ρ²)/√N = 0.0013
    expect(Math.abs(corr(a1, a2) - 0.9)).toBeLessThan(0.015);
    expect(Math.abs(corr(a1, b))).toBeLessThan(0.03);
    expect(corr(a1, au)).toBeGreaterThan(0.8); // a lot mixing distributions still shares its draw
    const [c1, c2] = draw(net, 20_000, "lots", { lotCorrelation: 0.5 });
    expect(Math.abs(corr(c1, c2) - 0.5)).toBeLessThan(0.03);
  });

  it("one part's grade does not change another part's draws (one uniform per variate)", () => {
    const [x1] = draw(netOf([{ tolerance: 0.05 }, { tolerance: 0.01 }]), 50, 9);
    const [y1] = draw(netOf([{ tolerance: 0.05 }, { tolerance: 0.1, distribution: "uniform" }]), 50, 9);
    expect(Array.from(y1)).toEqual(Array.from(x1));
  });

  it("exact parts stay exact, and bad tolerances are named", () => {
    const [x] = draw(netOf([{}]), 10);
    expect(Array.from(x).every((d) => d === 0)).toBe(true);
    expect(() => compileSampling(netOf([{ tolerance: 1 }]))).toThrow(/X0: tolerance must be a fraction 0 ≤ t < 1/);
    expect(() => compileSampling(netOf([{ toleranceAbs: 2e-9 }]))).toThrow(/toleranceAbs .* must be smaller than the value/);
    expect(() => compileSampling(netOf([{}]), { lotCorrelation: 1.5 })).toThrow(/lotCorrelation/);
  });
});

describe("seeded streams", () => {
  it("the same (seed, trial) gives the same numbers, others differ", () => {
    const take = (s: number | string, i: number) => Array.from({ length: 5 }, createTrialStream(s, i));
    expect(take(42, 7)).toEqual(take(42, 7));
    expect(take(42, 7)).not.toEqual(take(42, 8));
    expect(take(42, 7)).not.toEqual(take(43, 7));
    expect(take("42", 7)).toEqual(take(42, 7)); // documented: 42 and "42" name the same seed
  });

  it("validates seeds", () => {
    expect(validateSeed(2147483647)).toBe(2147483647);
    expect(() => validateSeed(2147483648)).toThrow(/integer 0..2147483647/);
    expect(() => validateSeed(1.5)).toThrow();
    expect(() => validateSeed("")).toThrow();
  });

  it("Acklam's inverse normal agrees with jStat.normal.inv to 1.2e-9 relative", () => {
    // Acklam (2003) states |relative error| < 1.15e-9; [C] jstat 1.9.6 normal.inv as the reference
    for (let k = 1; k < 200; k++) {
      const p = k / 200;
      const ref = jStat.normal.inv(p, 0, 1);
      expect(Math.abs(normalQuantileFast(p) - ref)).toBeLessThanOrEqual(1.2e-9 * Math.max(Math.abs(ref), 1e-3));
    }
    for (const p of [1e-6, 0.001, 0.02, 0.98, 0.99865]) {
      const ref = jStat.normal.inv(p, 0, 1);
      expect(Math.abs(normalQuantileFast(p) / ref - 1)).toBeLessThan(1.2e-9);
    }
  });
});
