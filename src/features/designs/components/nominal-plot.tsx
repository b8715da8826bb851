import { useMemo, useRef } from "react";
import type { SweepSpec } from "@shared/engine/frequency-grid";
import type { Netlist } from "@shared/engine/netlist";
import { CHART_COLORS, ResponseChart, type ChartMaskRect, type ChartSeries } from "@/components/charts/response-chart";
import { Alert } from "@/components/ui/alert";
import { useDebounced } from "@/features/designs/hooks/use-debounced";
import { computeNominal, type NominalResponse } from "@/features/designs/lib/nominal-response";
import type { Measured } from "@shared/contracts";

/** A limit rule as drawn (same shape as the limit sets' rules). */
export type MaskRule = { metric: string; from: number; to: number; min?: number; max?: number; label?: string };

export type NominalPlotProps = {
  /** The table's netlist, or null while it has errors (the last good response stays on screen). */
  netlist: Netlist | null;
  sweep: SweepSpec;
  rules?: MaskRule[];
  measured?: Measured | null;
};

function maskFor(rules: MaskRule[], metrics: string[], axisOf: (metric: string) => 0 | 1): ChartMaskRect[] {
  return rules.filter((r) => metrics.includes(r.metric)).map((r) => ({ ...r, axis: axisOf(r.metric), label: r.label || r.metric }));
}

/**
 * The nominal response, recomputed in the browser (debounced) as the table changes: transmission
 * |S21| with the S21 group delay on the right axis, and reflection |S11|, each with its limit mask.
 */
export function NominalPlot({ netlist, sweep, rules = [], measured }: NominalPlotProps) {
  const settled = useDebounced(netlist, 200);
  const bands = useMemo(() => rules.map((r) => ({ from: r.from, to: r.to })), [rules]);
  const result = useMemo((): { response: NominalResponse | null; error: string | null } => {
    if (!settled) return { response: null, error: null };
    try {
      return { response: computeNominal(settled, sweep, bands), error: null };
    } catch (error) {
      return { response: null, error: error instanceof Error ? error.message : String(error) };
    }
  }, [settled, sweep, bands]);
  const last = useLastGood(result.response);
  if (!last) return result.error ? <Alert tone="error">{result.error}</Alert> : <Alert>Fix the table to see the nominal response.</Alert>;

  const m = measured?.data;
  const transmission: ChartSeries[] = [
    { name: "|S21| nominal", x: last.freqs, y: last.s21Db, style: { color: CHART_COLORS.signal, width: 2 } },
    { name: "Group delay", x: last.freqs, y: last.gdNs, axis: 1, style: { color: CHART_COLORS.sky, dash: "dashed", width: 1.4 } },
    ...(m?.sDb.s21 ? [{ name: `|S21| ${measured!.name}`, x: m.freqs, y: m.sDb.s21, style: { color: CHART_COLORS.pass, width: 1.4 } }] : []),
  ];
  const reflection: ChartSeries[] = [
    { name: "|S11| nominal", x: last.freqs, y: last.s11Db, style: { color: CHART_COLORS.signal, width: 2 } },
    ...(m ? [{ name: `|S11| ${measured!.name}`, x: m.freqs, y: m.sDb.s11, style: { color: CHART_COLORS.pass, width: 1.4 } }] : []),
  ];
  return (
    <div className="flex flex-col gap-4">
      {result.error && <Alert tone="error">{result.error}</Alert>}
      {!netlist && <p className="text-xs text-signal-300">The table has errors; the plot shows the last valid parts.</p>}
      <ResponseChart
        title="Transmission |S21| and group delay"
        series={transmission}
        mask={maskFor(rules, ["s21_db", "gd_ns"], (metric) => (metric === "gd_ns" ? 1 : 0))}
        yAxis={{ label: "|S21| dB", min: -80, max: 5 }}
        y2Axis={{ label: "delay ns" }}
        height={300}
      />
      <ResponseChart
        title="Reflection |S11|"
        series={reflection}
        mask={maskFor(rules, ["s11_db"], () => 0)}
        yAxis={{ label: "|S11| dB", min: -60, max: 5 }}
        height={220}
      />
    </div>
  );
}

/** The latest non-null value seen (so a typo in the table does not blank the plot). */
function useLastGood<T>(value: T | null): T | null {
  const ref = useRef<T | null>(null);
  if (value) ref.current = value;
  return ref.current;
}
