import { Card } from "@/components/ui/card";
import type { CompareEntry } from "@/features/compare/api/get-compare";
import { ResponseChart, type ChartBand, type ChartSeries } from "@/components/charts/response-chart";
import { envelopeOf, LazyChart, maskOf, overlaidHistogramOption, percentileRow, ruleName } from "@/features/runs";

/** Overlaid |S| spreads (median and 5–95 % band per run) and overlaid margin histograms per rule. */
export function CompareCharts({ entries, colors }: { entries: CompareEntry[]; colors: readonly string[] }) {
  const done = entries.map((e, k) => ({ ...e, color: colors[k % colors.length], name: e.run.label || `${e.run.designName} r${e.run.revisionNumber}` })).filter((e) => e.result);
  const rules = done[0]?.result?.rules ?? [];
  const limits = done[0]?.result?.rules.map((r) => ({ metric: r.metric, from: r.from, to: r.to, min: r.min, max: r.max, label: r.label })) ?? [];

  const spread = (metric: string) => {
    const series: ChartSeries[] = [];
    const bands: ChartBand[] = [];
    for (const e of done) {
      const env = envelopeOf(e.result!, metric);
      if (!env) continue;
      const x = e.result!.envelopes.freqs;
      const p = (q: number) => percentileRow(e.result!, env, q);
      series.push({ name: e.name, x, y: p(50), style: { color: e.color, width: 1.6 } });
      bands.push({ name: `${e.name} 5–95 %`, x, lower: p(5), upper: p(95), color: e.color, opacity: 0.2 });
    }
    return series.length ? { series, bands, mask: maskOf(limits, metric) } : null;
  };

  return (
    <div className="flex flex-col gap-6">
      <Card title="Response spread" description="Median of each run, with its 5–95 % band in the same colour; red is outside the first run's limits.">
        <div className="grid gap-4 xl:grid-cols-2">
          {(["s21_db", "s11_db"] as const).map((metric) => {
            const layers = spread(metric);
            return layers && <ResponseChart key={metric} title={`|${metric.slice(0, 3).toUpperCase()}| spread of the compared runs`} {...layers} yAxis={{ label: "dB" }} height={320} />;
          })}
        </div>
      </Card>
      <Card title="Margins per rule" description="Share of each run's trials per margin bin.">
        <div className="grid gap-4 md:grid-cols-2">
          {rules.map((rule, r) => (
            <figure key={rule.index}>
              <figcaption className="mb-1 text-sm font-semibold text-paper-100">{ruleName(rule)}</figcaption>
              <LazyChart height={200} label={`Margin histograms of ${ruleName(rule)}`}
                option={overlaidHistogramOption(done.flatMap((e) => (e.result!.rules[r] ? [{ name: e.name, h: e.result!.rules[r].histogram, color: e.color }] : [])), rule.unit)} />
            </figure>
          ))}
        </div>
      </Card>
    </div>
  );
}
