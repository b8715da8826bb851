import { createColumnHelper } from "@tanstack/react-table";
import { Link } from "react-router-dom";
import { paths } from "@/config/paths";
import type { RunQuery } from "@/features/history/api/get-runs";
import { RunStateBadge } from "@/features/history/components/run-state-badge";
import type { RunSummary } from "@shared/contracts";
import { count, interval, percent } from "@/features/runs";
import { formatDateTime } from "@/utils/format";

export type SortKey = NonNullable<RunQuery["sort"]>;

/** Class names of a column's header cell and body cells (kept in the column's meta). */
export type RunColumnMeta = { headerClassName?: string; cellClassName?: string };

const col = createColumnHelper<RunSummary>();
const sortable = { enableSorting: true, sortDescFirst: true } as const;
const fixed = { enableSorting: false } as const;

/** The history's columns; the ids of the sortable ones are the server's `sort` values. */
export function runsTableColumns(selected: string[], onToggle: (runId: string) => void) {
  return [
    col.display({
      id: "compare",
      header: () => <span className="sr-only">Compare</span>,
      cell: ({ row: { original: run } }) => (
        <input type="checkbox" aria-label={`Compare ${run.designName} r${run.revisionNumber} ${run.label || run.id.slice(0, 8)}`} checked={selected.includes(run.id)}
          disabled={run.state !== "done"} onChange={() => onToggle(run.id)} className="size-4 accent-signal-500" />
      ),
    }),
    col.accessor("designName", {
      id: "design" satisfies SortKey, header: "design", ...sortable, meta: { cellClassName: "font-semibold" } satisfies RunColumnMeta,
      cell: ({ row: { original: run } }) => <>{run.designName} <span className="font-mono text-ink-300">r{run.revisionNumber}</span></>,
    }),
    col.display({
      id: "run", header: "run",
      cell: ({ row: { original: run } }) => (
        <Link className="font-semibold text-signal-300 underline decoration-signal-600/60" to={paths.app.run.getHref(run.id)}>
          {run.label || `run ${run.id.slice(0, 8)}`}
        </Link>
      ),
    }),
    col.accessor("state", { id: "state" satisfies SortKey, header: "state", ...sortable, cell: ({ getValue }) => <RunStateBadge state={getValue()} /> }),
    col.accessor("yield", {
      id: "yield" satisfies SortKey, header: "yield", ...sortable,
      meta: { headerClassName: "text-right", cellClassName: "whitespace-nowrap text-right font-mono" } satisfies RunColumnMeta,
      cell: ({ getValue }) => percent(getValue(), 1),
    }),
    col.accessor("wilson95", {
      header: "95 % interval", ...fixed,
      meta: { headerClassName: "text-right", cellClassName: "whitespace-nowrap text-right font-mono text-ink-300" } satisfies RunColumnMeta,
      cell: ({ getValue }) => interval(getValue(), 1),
    }),
    col.display({
      id: "trials", header: "trials",
      meta: { headerClassName: "text-right", cellClassName: "whitespace-nowrap text-right font-mono" } satisfies RunColumnMeta,
      cell: ({ row: { original: run } }) => <>{count(run.trialsDone)} / {count(run.trialsTotal)}</>,
    }),
    col.accessor((run) => run.launchedBy.name, { id: "by", header: "by", ...fixed, cell: ({ getValue }) => getValue() }),
    col.accessor("queuedAt", {
      id: "queuedAt" satisfies SortKey, header: "queued", ...sortable, meta: { cellClassName: "whitespace-nowrap text-ink-300" } satisfies RunColumnMeta,
      cell: ({ getValue }) => formatDateTime(getValue()),
    }),
    col.accessor("finishedAt", {
      id: "finishedAt" satisfies SortKey, header: "finished", ...sortable, meta: { cellClassName: "whitespace-nowrap text-ink-300" } satisfies RunColumnMeta,
      cell: ({ getValue }) => { const at = getValue(); return at ? formatDateTime(at) : "—"; },
    }),
  ];
}
