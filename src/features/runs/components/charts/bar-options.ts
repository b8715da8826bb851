import type { EChartsCoreOption } from "echarts/core";
import type { Histogram as HistogramJson } from "@shared/engine/stats/histogram";
import { axisStyle, baseTextStyle, chartColors } from "@/features/runs/components/charts/theme";

/**
 * Failure Pareto: failing trials per rule, largest first, with the cumulative share of all rule failures
 * (a trial failing two rules counts once per rule) on a second axis, in %.
 */
export function paretoOption(rows: { name: string; failures: number }[]): EChartsCoreOption {
  const sorted = [...rows].sort((a, b) => b.failures - a.failures);
  const total = sorted.reduce((s, r) => s + r.failures, 0);
  let running = 0;
  const cumulative = sorted.map((r) => ((running += r.failures), total > 0 ? (100 * running) / total : 0));
  return {
    animation: false,
    textStyle: baseTextStyle,
    grid: { left: 56, right: 48, top: 24, bottom: 64 },
    tooltip: { trigger: "axis" },
    xAxis: { type: "category", data: sorted.map((r) => r.name), ...axisStyle(""), axisLabel: { ...baseTextStyle, interval: 0, rotate: sorted.length > 3 ? 20 : 0 } },
    yAxis: [
      { type: "value", minInterval: 1, ...axisStyle("failing trials") },
      { type: "value", min: 0, max: 100, ...axisStyle("cumulative %"), splitLine: { show: false } },
    ],
    series: [
      { type: "bar", name: "failing trials", data: sorted.map((r) => r.failures), itemStyle: { color: chartColors.fault }, barMaxWidth: 48 },
      { type: "line", name: "cumulative %", yAxisIndex: 1, data: cumulative, symbolSize: 5, lineStyle: { color: chartColors.median }, itemStyle: { color: chartColors.median } },
    ],
  };
}

/** Centre of bin k of a fixed-bin histogram. */
export const binCentre = (h: HistogramJson, k: number) => h.lo + (k + 0.5) * h.binWidth;

/** Margin histogram of one rule: bars left of 0 (a failing margin) in the fault colour, the rest in pass. */
export function histogramOption(h: HistogramJson, unit: string): EChartsCoreOption {
  const digits = h.binWidth >= 1 ? 1 : h.binWidth >= 0.1 ? 2 : 3;
  return {
    animation: false,
    textStyle: baseTextStyle,
    grid: { left: 48, right: 12, top: 12, bottom: 40 },
    tooltip: { trigger: "axis" },
    xAxis: { type: "category", data: h.counts.map((_, k) => binCentre(h, k).toFixed(digits)), ...axisStyle(`margin (${unit})`), nameLocation: "middle", nameGap: 26 },
    yAxis: { type: "value", minInterval: 1, ...axisStyle("") },
    series: [{
      type: "bar", name: "trials", barCategoryGap: "8%",
      data: h.counts.map((c, k) => ({ value: c, itemStyle: { color: binCentre(h, k) < 0 ? chartColors.fault : chartColors.pass } })),
    }],
  };
}

/** Several runs' histograms of one rule on a shared margin axis, as fractions of each run's trials. */
export function overlaidHistogramOption(runs: { name: string; h: HistogramJson; color: string }[], unit: string): EChartsCoreOption {
  return {
    animation: false,
    textStyle: baseTextStyle,
    grid: { left: 48, right: 12, top: 30, bottom: 40 },
    legend: { top: 0, textStyle: baseTextStyle },
    tooltip: { trigger: "axis" },
    xAxis: { type: "value", scale: true, ...axisStyle(`margin (${unit})`), nameLocation: "middle", nameGap: 26 },
    yAxis: { type: "value", ...axisStyle(""), axisLabel: { ...baseTextStyle, formatter: (v: number) => `${v} %` } },
    series: runs.map(({ name, h, color }) => {
      const n = h.counts.reduce((s, c) => s + c, 0) + h.underflow + h.overflow || 1;
      return { type: "line", step: "middle", name, symbol: "none", lineStyle: { color, width: 1.5 }, itemStyle: { color },
        data: h.counts.map((c, k) => [binCentre(h, k), (100 * c) / n]) };
    }),
  };
}
