import { Button } from "@/components/ui/button";

/** "Runs 26–50 of 130" with previous and next. */
export function Pager({ page, pageSize, total, onPage }: { page: number; pageSize: number; total: number; onPage: (page: number) => void }) {
  const last = Math.max(1, Math.ceil(total / pageSize));
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  return (
    <nav aria-label="Pages" className="flex items-center justify-between gap-3 text-sm text-ink-300">
      <span className="font-mono">
        runs {first}–{Math.min(total, page * pageSize)} of {total}
      </span>
      <div className="flex gap-2">
        <Button variant="secondary" size="sm" disabled={page <= 1} onClick={() => onPage(page - 1)}>Previous</Button>
        <Button variant="secondary" size="sm" disabled={page >= last} onClick={() => onPage(page + 1)}>Next</Button>
      </div>
    </nav>
  );
}
