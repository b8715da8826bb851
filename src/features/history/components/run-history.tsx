import { useState } from "react";
import { Link, useSearchParams } from "react-router-dom";
import { Alert } from "@/components/ui/alert";
import { LoadingRegion } from "@/components/ui/spinner";
import { paths } from "@/config/paths";
import { RUN_QUERY_KEYS, useRuns, type RunQuery } from "@/features/history/api/get-runs";
import { Pager } from "@/features/history/components/pager";
import { RunFilters } from "@/features/history/components/run-filters";
import { RunsTable } from "@/features/history/components/runs-table";
import { useDesigns } from "@/features/designs";

/** The history: filters and sorting live in the address, so a filtered view can be shared as a link. */
export function RunHistory({ userId }: { userId: string }) {
  const [search, setSearch] = useSearchParams();
  const query = Object.fromEntries(RUN_QUERY_KEYS.map((k) => [k, search.get(k) ?? undefined])) as RunQuery;
  const sort = query.sort ?? "queuedAt";
  const dir = query.dir ?? "desc";
  const runs = useRuns({ ...query, sort, dir });
  const designs = useDesigns();
  const [selected, setSelected] = useState<string[]>([]);

  const patch = (change: Partial<RunQuery>) => {
    const next = new URLSearchParams(search);
    for (const [k, v] of Object.entries(change)) (v ? next.set(k, v) : next.delete(k));
    if (!("page" in change)) next.delete("page");
    setSearch(next, { replace: true });
  };
  const onSort = (key: NonNullable<RunQuery["sort"]>) => patch({ sort: key, dir: sort === key && dir === "desc" ? "asc" : "desc" });
  const toggle = (id: string) => setSelected((s) => (s.includes(id) ? s.filter((x) => x !== id) : s.length >= 6 ? s : [...s, id]));

  return (
    <div className="flex flex-col gap-4">
      <RunFilters query={query} designs={designs.data} userId={userId} onChange={patch} />
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <span className="text-ink-300">{selected.length} selected (2 to 6 finished runs)</span>
        {selected.length >= 2 && (
          <Link className="font-semibold text-signal-300 underline" to={paths.app.compare.getHref(selected)}>
            Compare selected
          </Link>
        )}
      </div>
      {runs.isError && <Alert tone="error">{runs.error.message}</Alert>}
      {runs.isPending && <LoadingRegion label="Loading runs…" />}
      {runs.data && (
        <>
          {runs.data.runs.length === 0 ? (
            <p className="text-sm text-ink-300">No run matches these filters.</p>
          ) : (
            <RunsTable runs={runs.data.runs} sort={sort} dir={dir} onSort={onSort} selected={selected} onToggle={toggle}
              page={runs.data.page} pageSize={runs.data.pageSize} total={runs.data.total} onPage={(p) => patch({ page: String(p) })} />
          )}
          <Pager page={runs.data.page} pageSize={runs.data.pageSize} total={runs.data.total} onPage={(p) => patch({ page: String(p) })} />
        </>
      )}
    </div>
  );
}
