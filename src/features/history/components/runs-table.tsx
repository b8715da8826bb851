import { Link } from "react-router-dom";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { paths } from "@/config/paths";
import type { RunQuery } from "@/features/history/api/get-runs";
import { RunStateBadge } from "@/features/history/components/run-state-badge";
import type { RunSummary } from "@/features/runs/api/types";
import { count, interval, percent } from "@/features/runs/utils/format";
import { formatDateTime } from "@/utils/format";

type SortKey = NonNullable<RunQuery["sort"]>;

export type RunsTableProps = {
  runs: RunSummary[];
  sort: SortKey;
  dir: "asc" | "desc";
  onSort: (sort: SortKey) => void;
  selected: string[];
  onToggle: (runId: string) => void;
};

/** Stored runs, one row each; the sortable headers ask the server to sort (aria-sort tells which). */
export function RunsTable({ runs, sort, dir, onSort, selected, onToggle }: RunsTableProps) {
  const header = (key: SortKey, text: string, className?: string) => (
    <TableHeaderCell className={className} aria-sort={sort === key ? (dir === "asc" ? "ascending" : "descending") : "none"}>
      <button type="button" className="uppercase tracking-wide hover:text-paper-100" onClick={() => onSort(key)}>
        {text} {sort === key ? (dir === "asc" ? "▲" : "▼") : ""}
      </button>
    </TableHeaderCell>
  );
  return (
    <Table>
      <TableCaption>Run history</TableCaption>
      <TableHead>
        <tr>
          <TableHeaderCell><span className="sr-only">Compare</span></TableHeaderCell>
          {header("design", "design")}
          <TableHeaderCell>run</TableHeaderCell>
          {header("state", "state")}
          {header("yield", "yield", "text-right")}
          <TableHeaderCell className="text-right">95 % interval</TableHeaderCell>
          <TableHeaderCell className="text-right">trials</TableHeaderCell>
          <TableHeaderCell>by</TableHeaderCell>
          {header("queuedAt", "queued")}
          {header("finishedAt", "finished")}
        </tr>
      </TableHead>
      <TableBody>
        {runs.map((run) => (
          <TableRow key={run.id}>
            <TableCell>
              <input type="checkbox" aria-label={`Compare ${run.designName} r${run.revisionNumber} ${run.label || run.id.slice(0, 8)}`} checked={selected.includes(run.id)}
                disabled={run.state !== "done"} onChange={() => onToggle(run.id)} className="size-4 accent-signal-500" />
            </TableCell>
            <TableCell className="font-semibold">{run.designName} <span className="font-mono text-ink-300">r{run.revisionNumber}</span></TableCell>
            <TableCell>
              <Link className="font-semibold text-signal-300 underline decoration-signal-600/60" to={paths.app.run.getHref(run.id)}>
                {run.label || `run ${run.id.slice(0, 8)}`}
              </Link>
            </TableCell>
            <TableCell><RunStateBadge state={run.state} /></TableCell>
            <TableCell className="whitespace-nowrap text-right font-mono">{percent(run.yield, 1)}</TableCell>
            <TableCell className="whitespace-nowrap text-right font-mono text-ink-300">{interval(run.wilson95, 1)}</TableCell>
            <TableCell className="whitespace-nowrap text-right font-mono">{count(run.trialsDone)} / {count(run.trialsTotal)}</TableCell>
            <TableCell>{run.launchedBy.name}</TableCell>
            <TableCell className="whitespace-nowrap text-ink-300">{formatDateTime(run.queuedAt)}</TableCell>
            <TableCell className="whitespace-nowrap text-ink-300">{run.finishedAt ? formatDateTime(run.finishedAt) : "—"}</TableCell>
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}
