import { Card } from "@/components/ui/card";
import type { RunResultView as RunResultJson } from "@shared/contracts";
import { histogramOption } from "@/features/runs/components/charts/bar-options";
import { LazyChart } from "@/features/runs/components/charts/lazy-chart";
import { count, fixed, ruleName } from "@/features/runs/utils/format";

/** One margin histogram per rule; a margin below 0 fails the rule. */
export function MarginHistograms({ result }: { result: RunResultJson }) {
  return (
    <Card title="Margins per rule" description="Distance to the nearest limit over the band; below 0 the trial fails the rule.">
      <div className="grid gap-4 md:grid-cols-2">
        {result.rules.map((rule) => (
          <figure key={rule.index} className="rounded-md border border-ink-700 p-3">
            <figcaption className="mb-1 flex flex-wrap justify-between gap-2 text-sm">
              <span className="font-semibold text-paper-100">{ruleName(rule)}</span>
              <span className="font-mono text-xs text-ink-300">
                nominal {fixed(rule.nominalMargin)} · mean {fixed(rule.marginMean)} · σ {fixed(rule.marginStd)} {rule.unit}
              </span>
            </figcaption>
            <LazyChart option={histogramOption(rule.histogram, rule.unit)} height={180} label={`Margin histogram for ${ruleName(rule)}`} />
            {(rule.histogram.underflow > 0 || rule.histogram.overflow > 0) && (
              <p className="font-mono text-xs text-ink-400">
                beyond the axis: {count(rule.histogram.underflow)} below, {count(rule.histogram.overflow)} above
              </p>
            )}
          </figure>
        ))}
      </div>
    </Card>
  );
}
