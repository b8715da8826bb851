import { flexRender, getCoreRowModel, useReactTable, type PaginationState, type SortingState, type Updater } from "@tanstack/react-table";
import { useMemo } from "react";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { runsTableColumns, type RunColumnMeta, type SortKey } from "@/features/history/components/runs-table-columns";
import type { RunSummary } from "@shared/contracts";

export type RunsTableProps = {
  runs: RunSummary[];
  sort: SortKey;
  dir: "asc" | "desc";
  onSort: (sort: SortKey) => void;
  selected: string[];
  onToggle: (runId: string) => void;
  /** The server's page (1-based), page size and total matching runs; the pager below the table moves between pages. */
  page?: number;
  pageSize?: number;
  total?: number;
  onPage?: (page: number) => void;
};

const resolve = <T,>(updater: Updater<T>, old: T): T => (typeof updater === "function" ? (updater as (old: T) => T)(old) : updater);

/**
 * Stored runs, one row each, on TanStack Table with manual (server-side) sorting and paging: the rows are the
 * server's page as given, the sortable headers ask the server to sort (aria-sort tells which).
 */
export function RunsTable({ runs, sort, dir, onSort, selected, onToggle, page = 1, pageSize, total, onPage }: RunsTableProps) {
  const columns = useMemo(() => runsTableColumns(selected, onToggle), [selected, onToggle]);
  const sorting: SortingState = [{ id: sort, desc: dir === "desc" }];
  const pagination: PaginationState = { pageIndex: page - 1, pageSize: pageSize ?? Math.max(1, runs.length) };
  const table = useReactTable({
    data: runs,
    columns,
    getRowId: (run) => run.id,
    getCoreRowModel: getCoreRowModel(),
    manualSorting: true,
    manualPagination: true,
    enableMultiSort: false,
    enableSortingRemoval: false,
    rowCount: total ?? runs.length,
    state: { sorting, pagination },
    // The direction is the existing handler's to choose (same column flips it, a new column starts descending).
    onSortingChange: (updater) => {
      const key = resolve(updater, sorting)[0]?.id as SortKey | undefined;
      if (key) onSort(key);
    },
    onPaginationChange: (updater) => onPage?.(resolve(updater, pagination).pageIndex + 1),
  });
  return (
    <Table>
      <TableCaption>Run history</TableCaption>
      <TableHead>
        {table.getHeaderGroups().map((group) => (
          <tr key={group.id}>
            {group.headers.map((header) => {
              const { column } = header;
              const meta = column.columnDef.meta as RunColumnMeta | undefined;
              const content = flexRender(column.columnDef.header, header.getContext());
              if (!column.getCanSort()) return <TableHeaderCell key={header.id} className={meta?.headerClassName}>{content}</TableHeaderCell>;
              const sorted = column.getIsSorted();
              return (
                <TableHeaderCell key={header.id} className={meta?.headerClassName} aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}>
                  <button type="button" className="uppercase tracking-wide hover:text-paper-100" onClick={() => column.toggleSorting()}>
                    {content} {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : ""}
                  </button>
                </TableHeaderCell>
              );
            })}
          </tr>
        ))}
      </TableHead>
      <TableBody>
        {table.getRowModel().rows.map((row) => (
          <TableRow key={row.id}>
            {row.getVisibleCells().map((cell) => (
              <TableCell key={cell.id} className={(cell.column.columnDef.meta as RunColumnMeta | undefined)?.cellClassName}>
                {flexRender(cell.column.columnDef.cell, cell.getContext())}
              </TableCell>
            ))}
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}
