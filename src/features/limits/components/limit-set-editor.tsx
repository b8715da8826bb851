import { useEffect, useMemo, useState, type KeyboardEvent } from "react";
import type { LimitRule } from "@shared/engine/limits";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Table, TableBody, TableCaption, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { TextField } from "@/components/ui/text-field";
import { ApiError } from "@/lib/api-client";
import { useSaveLimitSet } from "@/features/limits/api/save-limit-set";
import type { LimitSet } from "@shared/contracts";
import { apiRuleErrors, checkRule, newRuleRow, RULE_FIELDS, RULE_LABELS, rowFromRule, type RuleRow } from "@/features/limits/lib/rule-rows";
import { RuleRowView } from "@/features/limits/components/rule-row";

export type LimitSetEditorProps = {
  designId: string;
  limitSet: LimitSet | null;
  canEdit: boolean;
  /** The valid rules as typed, for the mask over the nominal plot. */
  onRulesChange: (rules: LimitRule[]) => void;
  onSaved: (limitSet: LimitSet) => void;
  /** Set when this limit set was just created: creating one re-mounts the editor under the new id, which would lose
   * the mutation's own success state. */
  justSaved?: boolean;
};

function gridKeys(event: KeyboardEvent<HTMLElement>) {
  const cell = (event.target as HTMLElement).dataset.cell;
  if (event.key !== "Enter" || !cell) return;
  const [row, col] = cell.split(":").map(Number);
  event.preventDefault();
  event.currentTarget.querySelector<HTMLElement>(`[data-cell="${row + (event.shiftKey ? -1 : 1)}:${col}"]`)?.focus();
}

/** A limit set as a table of rules with its name and lot size; saving is off while a cell is wrong. */
export function LimitSetEditor({ designId, limitSet, canEdit, onRulesChange, onSaved, justSaved }: LimitSetEditorProps) {
  const [name, setName] = useState(limitSet?.name ?? "");
  const [lotSize, setLotSize] = useState(String(limitSet?.lotSize ?? 1000));
  const [rows, setRows] = useState<RuleRow[]>(() => (limitSet ? limitSet.limits.rules.map(rowFromRule) : [newRuleRow()]));
  const save = useSaveLimitSet();
  const checks = useMemo(() => rows.map(checkRule), [rows]);
  const rules = useMemo(() => checks.flatMap((c) => (c.rule ? [c.rule] : [])), [checks]);
  useEffect(() => onRulesChange(rules), [rules, onRulesChange]);

  const serverErrors = save.error instanceof ApiError ? apiRuleErrors(save.error.fields) : {};
  const lot = Number(lotSize);
  const lotError = Number.isInteger(lot) && lot >= 1 ? undefined : "Lot size is a whole number ≥ 1.";
  const nameError = name.trim() ? undefined : "Name the limit set.";
  const cellErrors = checks.reduce((n, c) => n + Object.keys(c.errors).length, 0);
  const blocked = !canEdit || cellErrors > 0 || !!lotError || !!nameError;
  const set = (index: number, field: keyof RuleRow, text: string) => setRows((rs) => rs.map((r, k) => (k === index ? { ...r, [field]: text } : r)));

  function submit() {
    save.mutate({ designId, id: limitSet?.id ?? null, data: { name: name.trim(), lotSize: lot, limits: { rules } } }, { onSuccess: onSaved });
  }

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-[2fr_1fr]">
        <TextField label="Limit set name" value={name} maxLength={120} disabled={!canEdit} onChange={(e) => setName(e.target.value)} error={nameError} />
        <TextField label="Lot size" inputMode="numeric" value={lotSize} disabled={!canEdit} onChange={(e) => setLotSize(e.target.value)} error={lotError} />
      </div>
      <div onKeyDown={gridKeys}>
        <Table>
          <TableCaption>Rules</TableCaption>
          <TableHead>
            <TableRow>
              <TableHeaderCell className="w-8 px-2">#</TableHeaderCell>
              {RULE_FIELDS.map((f) => (
                <TableHeaderCell key={f} className="px-1.5">
                  {RULE_LABELS[f]}
                  {f === "from" || f === "to" ? " (Hz)" : ""}
                </TableHeaderCell>
              ))}
              {canEdit && <TableHeaderCell className="px-1.5" />}
            </TableRow>
          </TableHead>
          <TableBody>
            {rows.map((row, index) => (
              <RuleRowView
                key={row.key}
                index={index}
                row={row}
                errors={{ ...serverErrors[index], ...checks[index].errors }}
                readOnly={!canEdit}
                onChange={(field, text) => set(index, field, text)}
                onRemove={() => setRows((rs) => rs.filter((_, k) => k !== index))}
              />
            ))}
          </TableBody>
        </Table>
      </div>
      {canEdit && (
        <div className="flex flex-wrap gap-2">
          <Button size="sm" variant="secondary" onClick={() => setRows((rs) => [...rs, newRuleRow()])}>
            Add rule
          </Button>
          <Button className="ml-auto" disabled={blocked} pending={save.isPending} onClick={submit}>
            {limitSet ? "Save limit set" : "Create limit set"}
          </Button>
        </div>
      )}
      {cellErrors > 0 && <p className="text-xs text-fault-300">Fix the marked cells to save.</p>}
      {save.error && !Object.keys(serverErrors).length && <Alert tone="error">{save.error.message}</Alert>}
      {(save.isSuccess || (justSaved && save.isIdle)) && <Alert tone="success">Limit set saved.</Alert>}
    </div>
  );
}
