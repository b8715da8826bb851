import { CHART_COLORS, type ChartBand, type ChartMaskRect, type ChartSeries } from "@/components/charts/response-chart";
import type { EnvelopeSeries as EnvelopeSeriesJson } from "@shared/engine/result";
import type { LimitRule as LimitRuleJson } from "@shared/engine/limits";
import type { RunResultView as RunResultJson } from "@shared/contracts";

/** Null (a gap in stored JSON) as NaN, which the shared chart draws as a gap. */
export const gaps = (values: readonly (number | null)[]): number[] => values.map((v) => (v === null ? NaN : v));

/** The limit mask of one metric (e.g. "s21_db"), as the shared chart's rectangles. */
export function maskOf(rules: LimitRuleJson[], metric: string): ChartMaskRect[] {
  return rules.filter((r) => r.metric === metric).map((r) => ({ from: r.from, to: r.to, min: r.min, max: r.max, label: r.label }));
}

/** Percentile row p (1, 5, 50, 95, 99) of an envelope, gaps as NaN. */
export function percentileRow(result: RunResultJson, envelope: EnvelopeSeriesJson, p: number): number[] {
  const k = result.envelopes.percentiles.indexOf(p);
  return k < 0 ? [] : gaps(envelope.values[k] ?? []);
}

/** The 1–99 % and 5–95 % bands, the median and the nominal curve of one envelope. */
export function envelopeLayers(result: RunResultJson, envelope: EnvelopeSeriesJson, color: string = CHART_COLORS.signal, prefix = "") {
  const x = result.envelopes.freqs;
  const row = (p: number) => percentileRow(result, envelope, p);
  const bands: ChartBand[] = [
    { name: `${prefix}1–99 %`, x, lower: row(1), upper: row(99), color, opacity: 0.16 },
    { name: `${prefix}5–95 %`, x, lower: row(5), upper: row(95), color, opacity: 0.34 },
  ];
  const median: ChartSeries = { name: `${prefix}median`, x, y: row(50), style: { color, width: 1.6 } };
  const nominal: ChartSeries = { name: `${prefix}nominal`, x, y: envelope.nominal, style: { color: CHART_COLORS.paper, width: 1.2, dash: "dashed" } };
  return { bands, median, nominal };
}
