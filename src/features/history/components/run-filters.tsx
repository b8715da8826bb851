import type { RunQuery } from "@/features/history/api/get-runs";
import type { DesignView as DesignListItem } from "@shared/contracts";
import { RUN_STATES } from "@shared/contracts";

export type RunFiltersProps = { query: RunQuery; designs: DesignListItem[]; userId: string; onChange: (patch: Partial<RunQuery>) => void };

const input = "h-9 rounded-md border border-ink-600 bg-ink-950 px-2 text-sm text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400";

/** Filters of the history: design, state, launched from/to (dates), yield range (%), mine only. */
export function RunFilters({ query, designs, userId, onChange }: RunFiltersProps) {
  const pct = (v: string | undefined) => (v ? String(Number((Number(v) * 100).toPrecision(4))) : "");
  const fraction = (v: string) => (v.trim() === "" || !Number.isFinite(Number(v)) ? undefined : String(Number(v) / 100));
  return (
    <fieldset className="flex flex-wrap items-end gap-3" aria-label="Filters">
      <Field label="Design">
        <select className={input} value={query.designId ?? ""} onChange={(e) => onChange({ designId: e.target.value || undefined, revisionId: undefined })}>
          <option value="">all designs</option>
          {designs.map((d) => <option key={d.id} value={d.id}>{d.name}</option>)}
        </select>
      </Field>
      <Field label="State">
        <select className={input} value={query.state ?? ""} onChange={(e) => onChange({ state: e.target.value || undefined })}>
          <option value="">any state</option>
          {RUN_STATES.map((s) => <option key={s} value={s}>{s}</option>)}
        </select>
      </Field>
      <Field label="Queued from">
        <input type="date" className={input} value={query.from?.slice(0, 10) ?? ""} onChange={(e) => onChange({ from: e.target.value ? new Date(`${e.target.value}T00:00:00`).toISOString() : undefined })} />
      </Field>
      <Field label="Queued to">
        <input type="date" className={input} value={query.to?.slice(0, 10) ?? ""} onChange={(e) => onChange({ to: e.target.value ? new Date(`${e.target.value}T23:59:59.999`).toISOString() : undefined })} />
      </Field>
      <Field label="Yield ≥ %">
        <input className={`${input} w-20`} inputMode="decimal" defaultValue={pct(query.minYield)} onBlur={(e) => onChange({ minYield: fraction(e.target.value) })} />
      </Field>
      <Field label="Yield ≤ %">
        <input className={`${input} w-20`} inputMode="decimal" defaultValue={pct(query.maxYield)} onBlur={(e) => onChange({ maxYield: fraction(e.target.value) })} />
      </Field>
      <label className="flex h-9 items-center gap-2 text-sm text-paper-200">
        <input type="checkbox" className="size-4 accent-signal-500" checked={query.launchedBy === userId}
          onChange={(e) => onChange({ launchedBy: e.target.checked ? userId : undefined })} />
        Only my runs
      </label>
    </fieldset>
  );
}

function Field({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <label className="flex flex-col gap-1 text-xs font-semibold text-ink-300">
      {label}
      {children}
    </label>
  );
}
