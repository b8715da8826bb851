import { describe, expect, it } from "vitest";
import jstatModule from "jstat";
import { clopperPearsonInterval, wilsonHalfWidth, wilsonInterval } from "../../../shared/engine/stats/intervals";
import { exactSumAdd, exactSumCanonicalize, exactSumMerge, exactSumValue, type ExactSum } from "../../../shared/engine/stats/exact-sum";
import { histogramQuantile, histogramSlot } from "../../../shared/engine/stats/histogram";
import { normalCdf, normalQuantile, normalQuantileFast } from "../../../shared/engine/stats/normal";
import { EngineError } from "../../../shared/engine/errors";
import { createTrialStream } from "../../../shared/engine/random";
import { midranks, pearson } from "../../../shared/engine/stats/rank-correlation";
import { sampleRankCorrelation } from "simple-statistics";

const jStat = ((jstatModule as unknown as { jStat?: unknown }).jStat ?? jstatModule) as {
  beta: { inv(p: number, a: number, b: number): number };
  normal: { inv(p: number, m: number, s: number): number; cdf(x: number, m: number, s: number): number };
};

describe("Wilson and Clopper–Pearson intervals", () => {
  it("950/1000 at 95 % matches the worked numbers", () => {
    // REFERENCES.md §6 [C] scipy 1.17 binomtest(950, 1000).proportion_ci(0.95, 'wilson'): 0.934686 – 0.961870
    const [wl, wh] = wilsonInterval(950, 1000, 0.95);
    expect(wl).toBeCloseTo(0.934686, 6);
    expect(wh).toBeCloseTo(0.96187, 6);
    // REFERENCES.md §6 [C] scipy 'exact': 0.934610 – 0.962665
    const [cl, ch] = clopperPearsonInterval(950, 1000, 0.95);
    expect(cl).toBeCloseTo(0.93461, 6);
    expect(ch).toBeCloseTo(0.962665, 6);
  });

  it("4/20 at 90 % matches the worked numbers (NIST 7.2.4.2 example setup)", () => {
    // REFERENCES.md §6 [C] scipy: Wilson 0.093118 – 0.378377, Clopper–Pearson 0.071354 – 0.401028
    const [wl, wh] = wilsonInterval(4, 20, 0.9);
    expect(wl).toBeCloseTo(0.093118, 6);
    expect(wh).toBeCloseTo(0.378377, 6);
    const [cl, ch] = clopperPearsonInterval(4, 20, 0.9);
    expect(cl).toBeCloseTo(0.071354, 6);
    expect(ch).toBeCloseTo(0.401028, 6);
  });

  it("Clopper–Pearson agrees with jStat.beta.inv to 1e-9 over a grid of (x, n)", () => {
    // [C] jstat 1.9.6 beta.inv; REFERENCES.md §6 says jstat is within ~5e-11 of scipy, so 1e-9 is safe.
    for (const n of [1, 2, 5, 10, 37, 100, 1000]) {
      for (const x of new Set([0, 1, Math.floor(n / 3), Math.floor(n / 2), n - 1, n])) {
        if (x < 0 || x > n) continue;
        for (const conf of [0.9, 0.95, 0.99]) {
          const a = 1 - conf;
          const lo = x === 0 ? 0 : jStat.beta.inv(a / 2, x, n - x + 1);
          const hi = x === n ? 1 : jStat.beta.inv(1 - a / 2, x + 1, n - x);
          const [l, h] = clopperPearsonInterval(x, n, conf);
          expect(Math.abs(l - lo)).toBeLessThan(1e-9);
          expect(Math.abs(h - hi)).toBeLessThan(1e-9);
        }
      }
    }
  });

  it("Wilson agrees with the NIST formula evaluated with jStat's z over a grid", () => {
    // [C] NIST e-Handbook 7.2.4.1 formula with z = jStat.normal.inv(0.975)
    for (const n of [1, 3, 20, 1000, 123457]) {
      for (const x of new Set([0, 1, Math.floor(n / 2), n])) {
        const z = jStat.normal.inv(0.975, 0, 1);
        const p = x / n;
        const c = p + (z * z) / (2 * n);
        const hw = z * Math.sqrt((p * (1 - p)) / n + (z * z) / (4 * n * n));
        const d = 1 + (z * z) / n;
        const [l, h] = wilsonInterval(x, n);
        expect(Math.abs(l - (c - hw) / d)).toBeLessThan(1e-9);
        expect(Math.abs(h - (c + hw) / d)).toBeLessThan(1e-9);
      }
    }
    expect(wilsonHalfWidth(950, 1000)).toBeCloseTo((0.96187 - 0.934686) / 2, 6); // from the §6 worked numbers
  });

  it("rule of three: 0 failures in n gives a 90 % two-sided CP upper bound of 1 − 0.05^(1/n) ≈ 3/n", () => {
    // REFERENCES.md §6: one-sided 95 % bound = upper end of the two-sided 90 % CP interval = 1 − 0.05^(1/n) ≈ 2.996/n
    for (const n of [30, 3000, 30000]) {
      const [, hiFail] = clopperPearsonInterval(0, n, 0.9);
      expect(hiFail).toBeCloseTo(1 - Math.pow(0.05, 1 / n), 12);
      // −ln(0.05) = 2.996 (REFERENCES.md §6); 1 − 0.05^(1/n) = 2.996/n − O(1/n²), so n·U → 2.996 from below
      if (n >= 3000) expect(Math.abs(hiFail * n - 2.996)).toBeLessThan(0.005);
    }
    // The same seen from the yield side: n passes out of n → lower end 0.05^(1/n).
    const [lo, hi] = clopperPearsonInterval(3000, 3000, 0.9);
    expect(lo).toBeCloseTo(Math.pow(0.05, 1 / 3000), 12);
    expect(hi).toBe(1);
  });

  it("rejects bad inputs with INVALID_INPUT", () => {
    expect(() => wilsonInterval(5, 0)).toThrow(EngineError);
    expect(() => wilsonInterval(6, 5)).toThrow(/`x` must be an integer between 0 and n/);
    expect(() => clopperPearsonInterval(1, 5, 1)).toThrow(/`confidence`/);
  });
});

describe("normal distribution helpers", () => {
  it("Φ and Φ⁻¹ agree with jStat", () => {
    // Oracle: jstat 1.9.6 normal.cdf/inv. [C] measured at these points: |Δcdf| ≤ 1.2e-16, |Δinv| ≤ 1.1e-14, so the
    // 1e-12 / 1e-9 bounds leave margin. (REFERENCES.md §6's "jstat ~5e-11" is about beta.inv CP bounds, not these.)
    for (const z of [-4, -3, -1.5, 0, 0.7, 2, 3, 4]) expect(Math.abs(normalCdf(z) - jStat.normal.cdf(z, 0, 1))).toBeLessThan(1e-12);
    for (const p of [0.001, 0.025, 0.3, 0.5, 0.9, 0.975, 0.99865]) expect(Math.abs(normalQuantile(p) - jStat.normal.inv(p, 0, 1))).toBeLessThan(1e-9);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963985, 9); // REFERENCES.md §6: z(0.975) = 1.959963985
  });

  // IEEE edge cases, as documented in shared/engine/stats/normal.ts: normalCdf "NaN in, NaN out" and
  // Φ(±∞) = 1/0 (limits of ½·erfc(−z/√2)); normalQuantileFast "p outside (0, 1) gives ±Infinity at the ends
  // and NaN beyond"; normalQuantile passes Acklam's non-finite results through unrefined.
  it("normalCdf: NaN in gives NaN out", () => {
    expect(normalCdf(NaN)).toBeNaN();
  });

  it("normalCdf: Φ(+∞) = 1 and Φ(−∞) = 0", () => {
    expect(normalCdf(Infinity)).toBe(1);
    expect(normalCdf(-Infinity)).toBe(0);
  });

  for (const [name, q] of [
    ["normalQuantile", normalQuantile],
    ["normalQuantileFast", normalQuantileFast],
  ] as const) {
    it(`${name}: NaN in gives NaN out`, () => {
      expect(q(NaN)).toBeNaN();
    });

    it(`${name}: Φ⁻¹(0) = −∞ and Φ⁻¹(1) = +∞`, () => {
      expect(q(0)).toBe(-Infinity);
      expect(q(1)).toBe(Infinity);
    });

    it(`${name}: p outside [0, 1] gives NaN`, () => {
      for (const p of [-Number.MIN_VALUE, -0.5, -1, 1 + Number.EPSILON, 2, Infinity, -Infinity]) expect(q(p), `p=${p}`).toBeNaN();
    });
  }
});

describe("exact summation", () => {
  it("gives the correctly rounded sum whatever the order or split", () => {
    const rnd = createTrialStream("fsum", 0);
    const xs: number[] = [];
    for (let k = 0; k < 2000; k++) xs.push((rnd() - 0.5) * Math.pow(10, Math.floor(rnd() * 30) - 15));
    xs.push(1e16, 1, -1e16); // naive left-to-right summation loses the 1
    const whole: ExactSum = [];
    for (const x of xs) exactSumAdd(whole, x);
    const rev: ExactSum = [];
    for (let k = xs.length - 1; k >= 0; k--) exactSumAdd(rev, xs[k]);
    const a: ExactSum = [];
    const b: ExactSum = [];
    xs.forEach((x, k) => exactSumAdd(k % 3 === 0 ? a : b, x));
    const merged = exactSumMerge(b.slice(), a);
    expect(exactSumValue(rev)).toBe(exactSumValue(whole));
    // canonical expansions of the same exact value are identical lists
    expect(exactSumCanonicalize(rev.slice())).toEqual(exactSumCanonicalize(merged.slice()));
    expect(exactSumValue(exactSumCanonicalize(whole.slice()))).toBe(exactSumValue(whole));
    expect(exactSumValue(merged)).toBe(exactSumValue(whole));
    // [C] independent check with BigInt fixed point (all inputs are multiples of 2^-1100)
    const scaleExp = 1100n;
    const toBig = (x: number) => {
      const [m, e] = frexpInt(x);
      return e + 1100 >= 0 ? m << BigInt(e + 1100) : m >> BigInt(-(e + 1100));
    };
    let big = 0n;
    for (const x of xs) big += toBig(x);
    const approx = Number(big / 2n ** (scaleExp - 100n)) / 2 ** 100;
    expect(exactSumValue(whole)).toBeCloseTo(approx, 12);
    const naive = [1e16, 1, -1e16].reduce((s, x) => s + x, 0);
    expect(naive).toBe(0); // shows the case is hard for plain summation
    expect(exactSumValue(exactSumMerge([], [1e16, 1, -1e16]))).toBe(0 + 1); // exact answer 1
  });
});

describe("fixed-bin histograms", () => {
  it("places values and interpolates quantiles", () => {
    const lo = 0, hi = 10, bins = 10;
    const counts = new Float64Array(bins + 2);
    for (let k = 0; k < 1000; k++) counts[histogramSlot(lo, bins / (hi - lo), bins, (k + 0.5) / 100)]++;
    counts[histogramSlot(lo, 1, bins, -1)]++;
    counts[histogramSlot(lo, 1, bins, 12)]++;
    expect(counts[0]).toBe(1);
    expect(counts[11]).toBe(1);
    // [C] 1002 values, uniform on [0,10) plus one below and one above: the median is ≈ 5
    expect(histogramQuantile(lo, 1, bins, counts, 0, 0.5).value).toBeCloseTo(5, 1);
    expect(histogramQuantile(lo, 1, bins, counts, 0, 0.0005).clipped).toBe(true);
  });
});

function frexpInt(x: number): [bigint, number] {
  // x = m·2^e with integer m (53 bits) — exact decomposition through the IEEE bits
  if (x === 0) return [0n, 0];
  const buf = new DataView(new ArrayBuffer(8));
  buf.setFloat64(0, x);
  const bits = buf.getBigUint64(0);
  const sign = bits >> 63n ? -1n : 1n;
  const exp = Number((bits >> 52n) & 0x7ffn);
  const frac = bits & 0xfffffffffffffn;
  const m = exp === 0 ? frac : frac | (1n << 52n);
  const e = (exp === 0 ? 1 : exp) - 1075;
  return [sign * m, e];
}

describe("Spearman rank correlation", () => {
  it("agrees with simple-statistics sampleRankCorrelation, ties included", () => {
    // [C] simple-statistics 7.12 sampleRankCorrelation (midranks + Pearson) as the reference
    const rnd = createTrialStream("rank", 1);
    const x = Array.from({ length: 500 }, () => Math.round(rnd() * 40));
    const y = x.map((v) => v * v * (rnd() < 0.2 ? -1 : 1) + Math.round(rnd() * 30));
    expect(pearson(midranks(x), midranks(y))).toBeCloseTo(sampleRankCorrelation(x, y), 12);
    expect(Array.from(midranks([3, 1, 3, 2]))).toEqual([2.5, 0, 2.5, 1]); // [C] ranks 0..3, the two 3s share (2+3)/2
    expect(pearson(midranks([1, 1, 1, 1]), midranks([1, 2, 3, 4]))).toBeNull();
  });
});
