import { formatSi } from "@shared/units";
import type { PartKind } from "@shared/engine/netlist";
import { Button } from "@/components/ui/button";
import { TableCell, TableRow } from "@/components/ui/table";
import type { RowCheck } from "@/features/designs/lib/check-rows";
import { E_SERIES, FIELD_LABELS, KIND_UNITS, type PartField, type PartRow } from "@/features/designs/lib/part-rows";
import { CellInput } from "@/features/designs/components/cell-input";
import { cn } from "@/utils/cn";

const KIND_OPTIONS = [["R", "R"], ["L", "L"], ["C", "C"]] as const;
const SERIES_OPTIONS = [["", "none"], ...E_SERIES.map((s) => [s, s] as const)] as const;
const DIST_OPTIONS = [["", "—"], ["normal", "normal"], ["uniform", "uniform"]] as const;
const WIDTHS: Partial<Record<PartField, string>> = {
  ref: "w-14", kind: "w-12", node1: "w-14", node2: "w-14", value: "w-24", series: "w-20", tolerance: "w-16",
  distribution: "w-20", lot: "w-16", grade: "w-20", q: "w-28", srf: "w-20", esr: "w-20", esl: "w-20", tempco: "w-16",
};

export type PartRowProps = {
  index: number;
  row: PartRow;
  check: RowCheck;
  fields: readonly PartField[];
  count: number;
  readOnly: boolean;
  onChange: (field: PartField, text: string) => void;
  onMove: (by: -1 | 1) => void;
  onRemove: () => void;
};

/** One part: its cells in Tab order, the snapped value beside the ideal one, move/remove buttons. */
export function PartRowView({ index, row, check, fields, count, readOnly, onChange, onMove, onRemove }: PartRowProps) {
  const n = index + 1;
  return (
    <TableRow>
      <TableCell className="px-2 py-1.5 pt-3 font-mono text-xs text-ink-400">{n}</TableCell>
      {fields.map((field, col) => (
        <TableCell key={field} className="px-1.5 py-1.5">
          <div className={cn("flex items-start", field === "value" ? "flex-col gap-0.5" : "gap-2")}>
            <CellInput
              row={index}
              col={col}
              label={`${FIELD_LABELS[field]}, row ${n}`}
              value={row[field]}
              error={check.errors[field]}
              onChange={(text) => onChange(field, text)}
              options={field === "kind" ? KIND_OPTIONS : field === "series" ? SERIES_OPTIONS : field === "distribution" ? DIST_OPTIONS : undefined}
              list={field === "grade" ? `grades-${row.kind}` : undefined}
              className={WIDTHS[field]}
              readOnly={readOnly}
            />
            {field === "value" && check.snapped && <SnapNote snapped={check.snapped} kind={row.kind as PartKind} series={row.series} row={n} />}
          </div>
        </TableCell>
      ))}
      {!readOnly && (
        <TableCell className="px-1.5 py-1.5 whitespace-nowrap">
          <Button size="sm" variant="ghost" className="px-1.5" aria-label={`Move row ${n} up`} disabled={index === 0} onClick={() => onMove(-1)}>
            ↑
          </Button>
          <Button size="sm" variant="ghost" className="px-1.5" aria-label={`Move row ${n} down`} disabled={index === count - 1} onClick={() => onMove(1)}>
            ↓
          </Button>
          <Button size="sm" variant="ghost" className="px-1.5" aria-label={`Remove row ${n}`} onClick={onRemove}>
            ✕
          </Button>
        </TableCell>
      )}
    </TableRow>
  );
}

/** "→ 33 pF −1.2 %": the series member the part will be bought as, and how far it is from the ideal. */
function SnapNote({ snapped, kind, series, row }: { snapped: { value: number; error: number }; kind: PartKind; series: string; row: number }) {
  const pct = snapped.error * 100;
  const tone = Math.abs(pct) < 2 ? "text-pass-300" : Math.abs(pct) < 5 ? "text-signal-300" : "text-fault-300";
  return (
    <p className="font-mono text-[11px] leading-tight whitespace-nowrap" aria-label={`Row ${row} snapped to ${series}`} data-testid={`snap-${row}`}>
      <span className="text-paper-100">→ {formatSi(snapped.value, KIND_UNITS[kind] ?? "")}</span>{" "}
      <span className={cn(tone)}>
        {pct >= 0 ? "+" : "−"}
        {Math.abs(pct).toFixed(2)} %
      </span>
    </p>
  );
}
