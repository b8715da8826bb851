import { Button } from "@/components/ui/button";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import type { Grade } from "@shared/contracts";
import type { Part as NetlistPartJson } from "@shared/engine/netlist";
import type { Assignment } from "@/features/sweeps/api/sweeps";

export type AssignmentsEditorProps = { parts: NetlistPartJson[]; grades: Grade[]; value: Assignment[]; onChange: (next: Assignment[]) => void };

const cell = "h-8 rounded-md border border-ink-600 bg-ink-950 px-1.5 font-mono text-xs text-paper-50";

/** One row per assignment (a label and a grade per part); 1 to 12 rows. */
export function AssignmentsEditor({ parts, grades, value, onChange }: AssignmentsEditorProps) {
  const update = (k: number, next: Assignment) => onChange(value.map((a, i) => (i === k ? next : a)));
  const setGrade = (k: number, ref: string, code: string) => {
    const gradeOverrides = { ...value[k].gradeOverrides };
    if (code) gradeOverrides[ref] = code;
    else delete gradeOverrides[ref];
    update(k, { ...value[k], gradeOverrides });
  };
  return (
    <div className="flex flex-col gap-3">
      <Table>
        <TableCaption>Grade assignments</TableCaption>
        <TableHead>
          <tr>
            <TableHeaderCell>assignment</TableHeaderCell>
            {parts.map((p) => <TableHeaderCell key={p.ref} className="px-1.5 font-mono normal-case">{p.ref}</TableHeaderCell>)}
            <TableHeaderCell><span className="sr-only">Remove</span></TableHeaderCell>
          </tr>
        </TableHead>
        <TableBody>
          {value.map((a, k) => (
            <TableRow key={k}>
              <TableCell className="px-2">
                <input aria-label={`Label of assignment ${k + 1}`} className={`${cell} w-32`} value={a.label} maxLength={160} onChange={(e) => update(k, { ...a, label: e.target.value })} />
              </TableCell>
              {parts.map((p) => (
                <TableCell key={p.ref} className="px-1.5">
                  <select aria-label={`Assignment ${k + 1} grade for ${p.ref}`} className={cell} value={a.gradeOverrides[p.ref] ?? ""} onChange={(e) => setGrade(k, p.ref, e.target.value)}>
                    <option value="">as entered</option>
                    {grades.filter((g) => g.kind === p.kind).map((g) => <option key={g.id} value={g.code}>{g.code}</option>)}
                  </select>
                </TableCell>
              ))}
              <TableCell className="px-2">
                <Button variant="ghost" size="sm" className="px-2" aria-label={`Remove assignment ${k + 1}`} title="Remove" disabled={value.length <= 1}
                  onClick={() => onChange(value.filter((_, i) => i !== k))}>
                  ✕
                </Button>
              </TableCell>
            </TableRow>
          ))}
        </TableBody>
      </Table>
      <div>
        <Button variant="secondary" size="sm" disabled={value.length >= 12}
          onClick={() => onChange([...value, { label: `assignment ${value.length + 1}`, gradeOverrides: { ...(value[value.length - 1]?.gradeOverrides ?? {}) } }])}>
          Add assignment
        </Button>
      </div>
    </div>
  );
}
