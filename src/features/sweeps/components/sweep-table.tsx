import { Link } from "react-router-dom";
import { Badge } from "@/components/ui/badge";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { paths } from "@/config/paths";
import { interval, money, percent } from "@/features/runs";
import type { SweepResponse } from "@/features/sweeps/api/sweeps";
import { cn } from "@/utils/cn";

/** Yield, BOM cost and cost per good unit per assignment; the cheapest one that meets the target is marked. */
export function SweepTable({ data }: { data: SweepResponse }) {
  return (
    <Table>
      <TableCaption>Grade sweep results</TableCaption>
      <TableHead>
        <tr>
          <TableHeaderCell>assignment</TableHeaderCell>
          <TableHeaderCell>state</TableHeaderCell>
          <TableHeaderCell className="text-right">yield</TableHeaderCell>
          <TableHeaderCell className="text-right">95 % interval</TableHeaderCell>
          <TableHeaderCell className="text-right">BOM cost</TableHeaderCell>
          <TableHeaderCell className="text-right">cost per good unit</TableHeaderCell>
          <TableHeaderCell>target {percent(data.sweep.targetYield, 1)}</TableHeaderCell>
        </tr>
      </TableHead>
      <TableBody>
        {data.rows.map((row) => {
          const cheapest = row.runId === data.cheapestMeetingTarget;
          return (
            <TableRow key={row.runId} data-cheapest={cheapest || undefined} aria-current={cheapest ? "true" : undefined}
              className={cn(cheapest && "bg-pass-900/50 outline outline-1 -outline-offset-1 outline-pass-500 hover:bg-pass-900/70")}>
              <TableCell>
                <Link className="font-semibold text-signal-300 underline" to={paths.app.run.getHref(row.runId)}>{row.label}</Link>
                {cheapest && <Badge tone="pass" className="ml-2">cheapest meeting target</Badge>}
              </TableCell>
              <TableCell className="font-mono text-xs">{row.state}</TableCell>
              <TableCell className="text-right font-mono text-lg">{percent(row.yield, 1)}</TableCell>
              <TableCell className="text-right font-mono text-ink-300">{interval(row.wilson95, 1)}</TableCell>
              <TableCell className="text-right font-mono">{money(row.bomCost)}</TableCell>
              <TableCell className={cn("text-right font-mono", cheapest && "font-bold text-pass-300")}>{money(row.costPerGoodUnit)}</TableCell>
              <TableCell>
                {row.state !== "done" ? <span className="text-xs text-ink-400">waiting</span> : row.meetsTarget ? <Badge tone="pass">meets</Badge> : <Badge tone="fault">short</Badge>}
              </TableCell>
            </TableRow>
          );
        })}
      </TableBody>
    </Table>
  );
}
