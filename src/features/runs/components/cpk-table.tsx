import { Card } from "@/components/ui/card";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import type { RunResultView as RunResultJson } from "@shared/contracts";
import { count, fixed, ruleName } from "@/features/runs/utils/format";
import { cn } from "@/utils/cn";

/** Cpk per rule: one-sided mean/(3σ) of the rule's margin (the engine's definition); ≥ 1.33 is comfortable. */
export function CpkTable({ result }: { result: RunResultJson }) {
  return (
    <Card title="Capability per rule" description="Cpk = margin mean / (3σ). Below 1 the rule fails visibly often; 1.33 or more is comfortable.">
      <Table>
        <TableCaption>Cpk and failures per rule</TableCaption>
        <TableHead>
          <tr>
            <TableHeaderCell>rule</TableHeaderCell>
            <TableHeaderCell className="text-right">failing</TableHeaderCell>
            <TableHeaderCell className="text-right">mean</TableHeaderCell>
            <TableHeaderCell className="text-right">σ</TableHeaderCell>
            <TableHeaderCell className="text-right">Cpk</TableHeaderCell>
          </tr>
        </TableHead>
        <TableBody>
          {result.rules.map((rule) => (
            <TableRow key={rule.index}>
              <TableCell>{ruleName(rule)}</TableCell>
              <TableCell className="text-right font-mono">{count(rule.failures)}</TableCell>
              <TableCell className="text-right font-mono">{fixed(rule.marginMean)} {rule.unit}</TableCell>
              <TableCell className="text-right font-mono">{fixed(rule.marginStd, 3)}</TableCell>
              <TableCell className={cn("text-right font-mono font-semibold", cpkTone(rule.cpk))}>{fixed(rule.cpk)}</TableCell>
            </TableRow>
          ))}
        </TableBody>
      </Table>
    </Card>
  );
}

function cpkTone(cpk: number | null): string {
  if (cpk === null) return "text-ink-300";
  return cpk >= 1.33 ? "text-pass-300" : cpk >= 1 ? "text-signal-300" : "text-fault-300";
}
