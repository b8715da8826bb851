import { formatSi } from "@shared/units";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import type { LimitRule as LimitRuleJson } from "@shared/engine/limits";
import type { TrialReplay } from "@shared/contracts";
import { CHART_COLORS, ResponseChart, type ChartSeries } from "@/components/charts/response-chart";
import { maskOf } from "@/features/runs/utils/chart-props";
import { fixed } from "@/features/runs/utils/format";
import { cn } from "@/utils/cn";

const UNIT = { R: "Ω", L: "H", C: "F" } as const;

/** One trial as it was drawn: its part values, its margin on every rule, its full response against the mask. */
export function TrialReplayView({ trial, rules, nominal }: { trial: TrialReplay; rules: LimitRuleJson[]; nominal?: Record<string, number[]> }) {
  const chart = (key: string, metric: string, title: string) => {
    const y = trial.sDb[key];
    if (!y) return null;
    const curves: ChartSeries[] = [{ name: `trial ${trial.index}`, x: trial.freqs, y, style: { color: trial.pass ? CHART_COLORS.pass : CHART_COLORS.fault } }];
    if (nominal?.[key]?.length === trial.freqs.length) curves.push({ name: "nominal", x: trial.freqs, y: nominal[key], style: { color: CHART_COLORS.paper, width: 1.2, dash: "dashed" } });
    return (
      <figure key={key}>
        <figcaption className="mb-1 text-sm font-semibold text-paper-100">{title}</figcaption>
        <ResponseChart title={`${title} of trial ${trial.index}`} series={curves} mask={maskOf(rules, metric)} yAxis={{ label: "dB" }} height={300} />
      </figure>
    );
  };
  return (
    <div className="flex flex-col gap-6">
      <Card title={<span className="flex items-center gap-2">Trial {trial.index} <Badge tone={trial.pass ? "pass" : "fault"}>{trial.pass ? "passes" : "fails"}</Badge></span>}>
        <div className="grid gap-4 xl:grid-cols-2">
          {chart("s21", "s21_db", "|S21|")}
          {chart("s11", "s11_db", "|S11|")}
          {trial.gdNs.length === trial.freqs.length && (
            <figure>
              <figcaption className="mb-1 text-sm font-semibold text-paper-100">Group delay</figcaption>
              <ResponseChart title={`Group delay of trial ${trial.index}`} series={[{ name: "group delay", x: trial.freqs, y: trial.gdNs, style: { color: CHART_COLORS.signal } }]}
                mask={maskOf(rules, "gd_ns")} yAxis={{ label: "ns" }} height={260} />
            </figure>
          )}
        </div>
      </Card>
      <div className="grid gap-6 xl:grid-cols-2">
        <Card title="Part values">
          <Table>
            <TableCaption>Part values of the trial</TableCaption>
            <TableHead><tr><TableHeaderCell>part</TableHeaderCell><TableHeaderCell className="text-right">nominal</TableHeaderCell><TableHeaderCell className="text-right">drawn</TableHeaderCell><TableHeaderCell className="text-right">deviation</TableHeaderCell></tr></TableHead>
            <TableBody>
              {trial.parts.map((p) => (
                <TableRow key={p.ref}>
                  <TableCell className="font-mono">{p.ref}</TableCell>
                  <TableCell className="text-right font-mono">{formatSi(p.nominal, UNIT[p.kind])}</TableCell>
                  <TableCell className="text-right font-mono">{formatSi(p.value, UNIT[p.kind], 5)}</TableCell>
                  <TableCell className="text-right font-mono">{p.deviation >= 0 ? "+" : "−"}{Math.abs(p.deviation * 100).toFixed(2)} %</TableCell>
                </TableRow>
              ))}
            </TableBody>
          </Table>
        </Card>
        <Card title="Margins">
          <Table>
            <TableCaption>Margins of the trial per rule</TableCaption>
            <TableHead><tr><TableHeaderCell>rule</TableHeaderCell><TableHeaderCell className="text-right">margin</TableHeaderCell></tr></TableHead>
            <TableBody>
              {trial.margins.map((m) => (
                <TableRow key={m.rule}>
                  <TableCell>{m.label}</TableCell>
                  <TableCell className={cn("text-right font-mono", m.margin < 0 ? "font-bold text-fault-400" : "text-pass-300")}>{fixed(m.margin, 3)}</TableCell>
                </TableRow>
              ))}
            </TableBody>
          </Table>
        </Card>
      </div>
    </div>
  );
}
