import { useState } from "react";
import type { ESeriesName, PartKind } from "@shared/engine/netlist";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Checkbox } from "@/components/ui/checkbox";
import { Table, TableBody, TableCaption, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import type { PartsEditor } from "@/features/designs/hooks/use-parts-editor";
import { E_SERIES, EXTRA_FIELDS, FIELD_LABELS, PART_FIELDS } from "@/features/designs/lib/part-rows";
import { handleGridKeys } from "@/features/designs/components/cell-input";
import { PartRowView } from "@/features/designs/components/part-row";

export type GradeOption = { kind: PartKind; code: string; label: string };

/**
 * The parts table editor. Values take SI prefixes (33p, 4.7 nH, 1.2k); a series shows the member the
 * part snaps to and the error beside the ideal value. Tab runs along a row, Enter goes down a column.
 */
export function PartsTable({ editor, grades = [], readOnly = false }: { editor: PartsEditor; grades?: GradeOption[]; readOnly?: boolean }) {
  const [showExtras, setShowExtras] = useState(false);
  const [snapSeries, setSnapSeries] = useState<ESeriesName>("E24");
  const fields = showExtras ? PART_FIELDS : PART_FIELDS.filter((f) => !EXTRA_FIELDS.includes(f));
  const { rows, check, dispatch } = editor;

  return (
    <div className="flex flex-col gap-3">
      <div className="flex flex-wrap items-center gap-2">
        {!readOnly && (
          <>
            {(["R", "L", "C"] as const).map((kind) => (
              <Button key={kind} size="sm" variant="secondary" onClick={() => dispatch({ type: "add", kind })}>
                Add {kind}
              </Button>
            ))}
            <span className="mx-2 h-6 w-px bg-ink-700" aria-hidden="true" />
            <label className="flex items-center gap-2 text-xs text-paper-200">
              Snap all to
              <select
                aria-label="Series for snap all"
                className="h-8 rounded border border-ink-600 bg-ink-950 px-2 font-mono text-xs text-paper-50"
                value={snapSeries}
                onChange={(e) => setSnapSeries(e.target.value as ESeriesName)}
              >
                {E_SERIES.map((s) => (
                  <option key={s}>{s}</option>
                ))}
              </select>
            </label>
            <Button size="sm" variant="secondary" onClick={() => dispatch({ type: "snap-all", series: snapSeries })}>
              Snap all
            </Button>
            <Button size="sm" variant="ghost" onClick={() => dispatch({ type: "snap-all", series: "" })}>
              Clear series
            </Button>
          </>
        )}
        <Checkbox className="ml-auto" label="Loss and parasitics" checked={showExtras} onChange={(e) => setShowExtras(e.target.checked)} />
      </div>
      <div onKeyDown={handleGridKeys}>
        <Table>
          <TableCaption>Parts</TableCaption>
          <TableHead>
            <TableRow>
              <TableHeaderCell className="px-2">#</TableHeaderCell>
              {fields.map((f) => (
                <TableHeaderCell key={f} className="px-1.5">
                  {FIELD_LABELS[f]}
                </TableHeaderCell>
              ))}
              {!readOnly && <TableHeaderCell className="px-1.5">Order</TableHeaderCell>}
            </TableRow>
          </TableHead>
          <TableBody>
            {rows.map((row, index) => (
              <PartRowView
                key={row.key}
                index={index}
                row={row}
                check={check.rows[index]}
                fields={fields}
                count={rows.length}
                readOnly={readOnly}
                onChange={(field, text) => dispatch({ type: "set", index, field, text })}
                onMove={(by) => dispatch({ type: "move", index, by })}
                onRemove={() => dispatch({ type: "remove", index })}
              />
            ))}
          </TableBody>
        </Table>
      </div>
      {(["R", "L", "C"] as const).map((kind) => (
        <datalist key={kind} id={`grades-${kind}`}>
          {grades.filter((g) => g.kind === kind).map((g) => (
            <option key={g.code} value={g.code}>
              {g.label}
            </option>
          ))}
        </datalist>
      ))}
      {check.tableError && <Alert tone="error">{check.tableError}</Alert>}
      <p className="text-xs text-ink-300" aria-live="polite">
        {check.errorCount === 0 ? `${rows.length} parts, no errors.` : `${check.errorCount} ${check.errorCount === 1 ? "cell needs" : "cells need"} attention.`}
      </p>
    </div>
  );
}
