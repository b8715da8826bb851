import { formatSi } from "@shared/units";
import type { Grade } from "@shared/contracts";
import type { Part as NetlistPartJson } from "@shared/engine/netlist";
import { Table, TableBody, TableCaption, TableCell, TableHead, TableHeaderCell, TableRow } from "@/components/ui/table";
import { money } from "@/features/runs/utils/format";

/** How a part's tolerance reads: "±2 %", "±0.25 pF", or "exact". */
export function toleranceText(t: { tolerance?: number | null; toleranceAbs?: number | null }, kind: string): string {
  // Absolute tolerances read in the unit the trade quotes them in: pF for capacitors, nH for inductors.
  if (t.toleranceAbs && kind === "C") return `±${Number((t.toleranceAbs * 1e12).toPrecision(3))} pF`;
  if (t.toleranceAbs && kind === "L") return `±${Number((t.toleranceAbs * 1e9).toPrecision(3))} nH`;
  if (t.toleranceAbs) return `±${formatSi(t.toleranceAbs, "Ω", 3)}`;
  if (t.tolerance) return `±${Number((t.tolerance * 100).toPrecision(3))} %`;
  return "exact";
}

export type GradeOverridesEditorProps = {
  parts: NetlistPartJson[];
  grades: Grade[];
  value: Record<string, string>;
  onChange: (next: Record<string, string>) => void;
};

/** One grade choice per part (only grades of the part's kind); "as entered" keeps the revision's tolerance. */
export function GradeOverridesEditor({ parts, grades, value, onChange }: GradeOverridesEditorProps) {
  const set = (ref: string, code: string) => {
    const next = { ...value };
    if (code) next[ref] = code;
    else delete next[ref];
    onChange(next);
  };
  return (
    <Table>
      <TableCaption>Grade per part</TableCaption>
      <TableHead>
        <tr>
          <TableHeaderCell>part</TableHeaderCell>
          <TableHeaderCell>as entered</TableHeaderCell>
          <TableHeaderCell>grade for this run</TableHeaderCell>
        </tr>
      </TableHead>
      <TableBody>
        {parts.map((part) => (
          <TableRow key={part.ref}>
            <TableCell className="font-mono">{part.ref}</TableCell>
            <TableCell className="font-mono text-ink-300">{part.grade ?? toleranceText(part, part.kind)}</TableCell>
            <TableCell>
              <select
                aria-label={`Grade for ${part.ref}`}
                value={value[part.ref] ?? ""}
                onChange={(e) => set(part.ref, e.target.value)}
                className="h-8 rounded-md border border-ink-600 bg-ink-950 px-2 font-mono text-xs text-paper-50"
              >
                <option value="">as entered</option>
                {grades.filter((g) => g.kind === part.kind).map((g) => (
                  <option key={g.id} value={g.code}>
                    {g.code} · {toleranceText(g, g.kind)} · {money(g.costEach)}
                  </option>
                ))}
              </select>
            </TableCell>
          </TableRow>
        ))}
      </TableBody>
    </Table>
  );
}
