/**
 * finalizeRun: from a merged aggregate to the reported run result, with named fields.
 *
 * - yield = passed/trials with 95 % Wilson and Clopper–Pearson intervals (stats/intervals.ts).
 * - per rule: failures, margin mean and sample standard deviation from exact sums
 *   (mean = S1/n, s² = (S2 − S1²/n)/(n − 1)), min/max, the fixed-bin histogram, and
 *   Cpk = mean/(3s): the margin is a one-sided distance to the nearest limit (for a min+max rule it is
 *   already the smaller of both sides), so this is the one-sided Cpk = (μ − limit)/(3σ) of the
 *   worst-case band statistic. Null when s = 0 or n < 2.
 * - envelopes: 1/5/50/95/99 % quantiles of every |S_ij| dB per grid point from the fixed-bin
 *   histograms (resolution = one bin, default 0.02 dB; window nominal ± 6 dB; a quantile beyond the
 *   window is reported at the window edge and counted in `clipped`). With several temperature corners
 *   every (trial, corner) response is one sample of the envelope.
 * - sensitivity: Spearman ρ of each part's relative deviation with each rule's margin over the
 *   first `sensitivitySampleSize` trials by index (default 5000), so it does not depend on chunking.
 * Numbers that are not finite are reported as null so the result is valid JSON.
 */
import { denseEnvelope, type TrialAggregate } from "./aggregate";
import { exactSumValue } from "./stats/exact-sum";
import { histogramQuantile, toHistogram, type Histogram } from "./stats/histogram";
import { clopperPearsonInterval, wilsonInterval } from "./stats/intervals";
import { midranks, pearson } from "./stats/rank-correlation";
import type { RunSeed } from "./random";

/** Envelope percentiles reported. */
export const ENVELOPE_PERCENTILES = [1, 5, 50, 95, 99] as const;

/** Per-rule summary. */
export interface RuleSummary {
  index: number;
  metric: string;
  label?: string;
  from: number;
  to: number;
  min?: number;
  max?: number;
  unit: "dB" | "ns";
  failures: number;
  nominalMargin: number | null;
  marginMean: number | null;
  marginStd: number | null;
  marginMin: number | null;
  marginMax: number | null;
  cpk: number | null;
  histogram: Histogram;
}

/** Percentile envelope of one S-parameter. */
export interface EnvelopeSeries {
  metric: string;
  nominal: number[];
  /** values[k][f]: the ENVELOPE_PERCENTILES[k] percentile at freqs[f], dB */
  values: (number | null)[][];
  /** number of (percentile, point) entries that fell outside the window */
  clipped: number;
}

/** The reported result of a run. */
export interface RunResult {
  seed: RunSeed;
  trials: number;
  passed: number;
  yield: number;
  wilson95: [number, number];
  clopperPearson95: [number, number];
  halfWidth95: number;
  ruleFailures: number[];
  failingTrials: number[];
  rules: RuleSummary[];
  corners: number[];
  envelopes: { freqs: number[]; percentiles: number[]; binDb: number; spanDb: number; series: EnvelopeSeries[] };
  sensitivity: { sampleSize: number; parts: string[]; /** rho[r][p] */ rho: (number | null)[][] };
  stop: { trialCap: number; targetHalfWidth: number | null; stoppedEarly: boolean };
}

/**
 * Builds the run result from an aggregate.
 * @param agg merged aggregate of trials 0..n−1
 * @param stop optional stop-when-sure facts (default: no target)
 * @example finalizeRun(agg).wilson95 // [0.93, 0.96]
 */
export function finalizeRun(agg: TrialAggregate, stop?: { targetHalfWidth: number | null }): RunResult {
  const m = agg.meta;
  const n = agg.trials;
  const wilson = n > 0 ? wilsonInterval(agg.passed, n) : ([0, 1] as [number, number]);
  const cp = n > 0 ? clopperPearsonInterval(agg.passed, n) : ([0, 1] as [number, number]);
  const rules = m.rules.map((rule, r) => summarizeRule(agg, r, rule));
  return {
    seed: m.seed,
    trials: n,
    passed: agg.passed,
    yield: n > 0 ? agg.passed / n : 0,
    wilson95: wilson,
    clopperPearson95: cp,
    halfWidth95: (wilson[1] - wilson[0]) / 2,
    ruleFailures: agg.ruleFailures.slice(),
    failingTrials: agg.failing.slice(),
    rules,
    corners: m.corners.slice(),
    envelopes: envelopesOf(agg),
    sensitivity: sensitivityOf(agg),
    stop: { trialCap: m.trialCap, targetHalfWidth: stop?.targetHalfWidth ?? null, stoppedEarly: n < m.trialCap },
  };
}

function summarizeRule(agg: TrialAggregate, r: number, rule: TrialAggregate["meta"]["rules"][number]): RuleSummary {
  const n = agg.trials;
  const s1 = exactSumValue(agg.marginSum[r]);
  const s2 = exactSumValue(agg.marginSumSq[r]);
  const mean = n > 0 ? s1 / n : NaN;
  const variance = n > 1 ? Math.max(0, (s2 - (s1 * s1) / n) / (n - 1)) : NaN;
  const std = Math.sqrt(variance);
  const edges = agg.meta.marginEdges[r];
  const stride = edges.bins + 2;
  const out: RuleSummary = {
    index: r, metric: rule.metric, from: rule.from, to: rule.to, unit: rule.unit,
    failures: agg.ruleFailures[r],
    nominalMargin: finite(agg.meta.nominalMargins[r]),
    marginMean: finite(mean),
    marginStd: finite(std),
    marginMin: finite(agg.marginMin[r]),
    marginMax: finite(agg.marginMax[r]),
    cpk: std > 0 ? finite(mean / (3 * std)) : null,
    histogram: toHistogram(edges, agg.marginCounts.subarray(r * stride, (r + 1) * stride)),
  };
  if (rule.label !== undefined) out.label = rule.label;
  if (rule.min !== undefined) out.min = rule.min;
  if (rule.max !== undefined) out.max = rule.max;
  return out;
}

function envelopesOf(agg: TrialAggregate): RunResult["envelopes"] {
  const m = agg.meta;
  const F = m.freqs.length;
  const bins = m.envelopeBins;
  const stride = bins + 2;
  const envelope = denseEnvelope(agg);
  const series: EnvelopeSeries[] = m.pairs.map((metric, k) => {
    const nominal = m.nominalDb.slice(k * F, (k + 1) * F);
    const values: (number | null)[][] = ENVELOPE_PERCENTILES.map(() => new Array<number | null>(F).fill(null));
    let clipped = 0;
    for (let f = 0; f < F; f++) {
      const lo = nominal[f] - m.envelopeSpanDb;
      ENVELOPE_PERCENTILES.forEach((pct, q) => {
        const res = histogramQuantile(lo, m.envelopeBinDb, bins, envelope, (k * F + f) * stride, pct / 100);
        if (res.clipped) clipped++;
        values[q][f] = finite(res.value);
      });
    }
    return { metric, nominal, values, clipped };
  });
  return { freqs: m.freqs.slice(), percentiles: [...ENVELOPE_PERCENTILES], binDb: m.envelopeBinDb, spanDb: m.envelopeSpanDb, series };
}

function sensitivityOf(agg: TrialAggregate): RunResult["sensitivity"] {
  const P = agg.meta.partRefs.length;
  const R = agg.meta.rules.length;
  const segs = agg.sample;
  const n = segs.reduce((s, g) => s + g.count, 0);
  const dev = new Float64Array(n * P);
  const mar = new Float64Array(n * R);
  let t = 0;
  for (const g of segs) {
    dev.set(g.deviations, t * P);
    mar.set(g.margins, t * R);
    t += g.count;
  }
  const column = (src: Float64Array, stride: number, c: number) => {
    const col = new Float64Array(n);
    for (let k = 0; k < n; k++) col[k] = src[k * stride + c];
    return midranks(col);
  };
  const partRanks = Array.from({ length: P }, (_, p) => column(dev, P, p));
  const rho = Array.from({ length: R }, (_, r) => {
    const mr = column(mar, R, r);
    return partRanks.map((pr) => pearson(pr, mr));
  });
  return { sampleSize: n, parts: agg.meta.partRefs.slice(), rho };
}

function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
