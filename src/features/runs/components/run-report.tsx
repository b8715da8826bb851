import type { ReactNode } from "react";
import { formatSi } from "@shared/units";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import type { RunEconomics as Economics, RunDetail, RunResultView as RunResultJson } from "@shared/contracts";
import { CpkTable } from "@/features/runs/components/cpk-table";
import { EconomicsPanel } from "@/features/runs/components/economics-panel";
import { ResponseChart } from "@/components/charts/response-chart";
import { envelopeLayers, maskOf } from "@/features/runs/utils/chart-props";
import { RunFacts } from "@/features/runs/components/run-facts";
import { toleranceText } from "@/features/runs/components/grade-overrides-editor";
import { YieldHeadline } from "@/features/runs/components/yield-headline";
import { hz, ruleName } from "@/features/runs/utils/format";

const UNIT = { R: "Ω", L: "H", C: "F" } as const;

/** The run on paper: inputs (parts, limits, options), yield, capability, money, the |S21| and |S11| spread. */
export function RunReport({ run, result, economics, caution }: { run: RunDetail; result: RunResultJson; economics: Economics | null; caution: ReactNode }) {
  return (
    <article className="report flex flex-col gap-6">
      <Section title="Result">
        <YieldHeadline result={result} />
      </Section>
      {caution}
      <Section title="Inputs"><RunFacts run={run} /></Section>
      <div className="grid gap-6 lg:grid-cols-2">
        <Section title="Parts">
          <Table>
            <TableCaption>Parts as run (after grade overrides)</TableCaption>
            <TableHead><tr><TableHeaderCell>part</TableHeaderCell><TableHeaderCell>nodes</TableHeaderCell><TableHeaderCell className="text-right">value</TableHeaderCell><TableHeaderCell>tolerance</TableHeaderCell><TableHeaderCell>grade</TableHeaderCell></tr></TableHead>
            <TableBody>
              {run.netlist.parts.map((p) => (
                <TableRow key={p.ref}>
                  <TableCell className="font-mono">{p.ref}</TableCell>
                  <TableCell className="font-mono text-xs">{p.nodes.join("–")}</TableCell>
                  <TableCell className="text-right font-mono">{formatSi(p.value, UNIT[p.kind])}</TableCell>
                  <TableCell className="font-mono">{toleranceText(p, p.kind)} {p.distribution ?? "normal"}</TableCell>
                  <TableCell className="font-mono">{p.grade ?? "—"}</TableCell>
                </TableRow>
              ))}
            </TableBody>
          </Table>
        </Section>
        <Section title="Acceptance limits">
          <Table>
            <TableCaption>Limits applied</TableCaption>
            <TableHead><tr><TableHeaderCell>rule</TableHeaderCell><TableHeaderCell>metric</TableHeaderCell><TableHeaderCell>band</TableHeaderCell><TableHeaderCell className="text-right">min</TableHeaderCell><TableHeaderCell className="text-right">max</TableHeaderCell></tr></TableHead>
            <TableBody>
              {run.limits.rules.map((r, k) => (
                <TableRow key={k}>
                  <TableCell>{ruleName(r)}</TableCell>
                  <TableCell className="font-mono">{r.metric}</TableCell>
                  <TableCell className="font-mono text-xs">{hz(r.from)}–{hz(r.to)}</TableCell>
                  <TableCell className="text-right font-mono">{r.min ?? "—"}</TableCell>
                  <TableCell className="text-right font-mono">{r.max ?? "—"}</TableCell>
                </TableRow>
              ))}
            </TableBody>
          </Table>
        </Section>
      </div>
      <div className="grid gap-6 lg:grid-cols-2">
        {["s21_db", "s11_db"].flatMap((metric) => result.envelopes.series.filter((s) => s.metric === metric)).map((envelope) => {
          const layers = envelopeLayers(result, envelope);
          const name = `|${envelope.metric.slice(0, 3).toUpperCase()}| spread`;
          return (
            <figure key={envelope.metric} className="flex flex-col gap-1">
              <figcaption className="text-sm font-semibold text-paper-100">{name}</figcaption>
              <div className="print-plate rounded-md border border-ink-700 bg-ink-950 p-3">
                <ResponseChart title={`${name}: 1–99 % and 5–95 % bands, median, nominal, limit mask`} series={[layers.median, layers.nominal]} bands={layers.bands}
                  mask={maskOf(run.limits.rules, envelope.metric)} yAxis={{ label: "dB" }} height={280} />
              </div>
            </figure>
          );
        })}
      </div>
      <div className="grid gap-6 lg:grid-cols-2">
        <CpkTable result={result} />
        <EconomicsPanel economics={economics} />
      </div>
    </article>
  );
}

function Section({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="flex flex-col gap-3">
      <h2 className="text-base font-semibold text-paper-50">{title}</h2>
      {children}
    </section>
  );
}
