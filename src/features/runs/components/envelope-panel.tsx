import { useState } from "react";
import { Card } from "@/components/ui/card";
import { useMeasured } from "@/features/designs";
import type { LimitRule as LimitRuleJson } from "@shared/engine/limits";
import type { RunResultView as RunResultJson } from "@shared/contracts";
import { CHART_COLORS, ResponseChart, type ChartSeries } from "@/components/charts/response-chart";
import { envelopeOf } from "@/features/runs/utils/analysis";
import { envelopeLayers, gaps, maskOf } from "@/features/runs/utils/chart-props";

const METRICS = [
  { metric: "s21_db", key: "s21", title: "|S21| spread", label: "Transmission |S21| percentile envelope with limit mask" },
  { metric: "s11_db", key: "s11", title: "|S11| spread", label: "Reflection |S11| percentile envelope with limit mask" },
] as const;

export type MeasuredChoice = { id: string; name: string };

/** |S21| and |S11| envelopes (1–99 % and 5–95 % bands, median), nominal, an optional measured curve and the mask. */
export function EnvelopePanel({ result, rules, measured }: { result: RunResultJson; rules: LimitRuleJson[]; measured: MeasuredChoice[] }) {
  const [measuredId, setMeasuredId] = useState<string>(measured[0]?.id ?? "");
  const curve = useMeasured(measuredId || null);

  return (
    <Card
      title="Response spread"
      description="Bands hold 98 % and 90 % of the trials at each frequency; shaded red is outside the limits."
      actions={
        measured.length > 0 && (
          <label className="flex items-center gap-2 text-xs text-ink-300">
            Measured
            <select className="h-8 rounded-md border border-ink-600 bg-ink-950 px-2 text-sm text-paper-100" value={measuredId} onChange={(e) => setMeasuredId(e.target.value)}>
              <option value="">none</option>
              {measured.map((m) => (
                <option key={m.id} value={m.id}>{m.name}</option>
              ))}
            </select>
          </label>
        )
      }
    >
      <div className="grid gap-4 xl:grid-cols-2">
        {METRICS.map(({ metric, key, title, label }) => {
          const envelope = envelopeOf(result, metric);
          if (!envelope) return null;
          const y = curve.data?.data.sDb[key];
          const layers = envelopeLayers(result, envelope);
          const measuredCurve: ChartSeries[] = curve.data && y ? [{ name: `measured: ${curve.data.name}`, x: curve.data.data.freqs, y: gaps(y), style: { color: CHART_COLORS.pass, width: 1.4 } }] : [];
          return (
            <figure key={metric}>
              <figcaption className="mb-1 text-sm font-semibold text-paper-100">{title}</figcaption>
              <ResponseChart title={label} series={[layers.median, layers.nominal, ...measuredCurve]} bands={layers.bands} mask={maskOf(rules, metric)} yAxis={{ label: "dB" }} height={320} />
              {envelope.clipped > 0 && <p className="font-mono text-xs text-ink-400">{envelope.clipped} percentile points lie beyond ±{result.envelopes.spanDb} dB of nominal and are drawn at the edge.</p>}
            </figure>
          );
        })}
      </div>
      <p className="mt-2 flex flex-wrap gap-4 text-xs text-ink-300" aria-hidden="true">
        <span><span className="mr-1 inline-block h-2 w-4 bg-signal-500/20 align-middle" />1–99 % of trials</span>
        <span><span className="mr-1 inline-block h-2 w-4 bg-signal-500/50 align-middle" />5–95 %</span>
        <span><span className="mr-1 inline-block h-2 w-4 border border-fault-400 bg-fault-500/20 align-middle" />outside the limits</span>
      </p>
    </Card>
  );
}
