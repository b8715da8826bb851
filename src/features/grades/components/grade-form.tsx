import { useState, type FormEvent } from "react";
import type { PartKind } from "@shared/engine/netlist";
import { readTolerance } from "@shared/tolerance";
import { formatSi } from "@shared/units";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { useSaveGrade } from "@/features/grades/api/save-grade";
import type { Grade } from "@shared/contracts";
import type { GradeBodyInput as GradeInput } from "@shared/schemas/design";

type Errors = Partial<Record<"code" | "label" | "tolerance" | "costEach", string>>;
const select = "h-10 rounded-md border border-ink-600 bg-ink-950 px-3 text-sm text-paper-50";

/** The grade's tolerance, read by the one shared reader (shared/tolerance.ts) as the parts table and CSV read it. */
function readGradeTolerance(text: string, kind: PartKind): Pick<GradeInput, "tolerance" | "toleranceAbs"> | string {
  const r = readTolerance(text, kind);
  return r.ok ? r.value : `${r.error.charAt(0).toUpperCase()}${r.error.slice(1)}.`;
}

function toleranceText(g: Grade | null): string {
  if (!g) return "";
  if (g.toleranceAbs !== null) return formatSi(g.toleranceAbs, g.kind === "C" ? "F" : g.kind === "L" ? "H" : "Ω");
  return g.tolerance !== null ? `${Number((g.tolerance * 100).toPrecision(6))}%` : "";
}

/** Add a grade or change one (planner): kind, code, label, tolerance, distribution, cost each. */
export function GradeForm({ grade, onDone }: { grade: Grade | null; onDone: () => void }) {
  const [kind, setKind] = useState<PartKind>(grade?.kind ?? "C");
  const [code, setCode] = useState(grade?.code ?? "");
  const [label, setLabel] = useState(grade?.label ?? "");
  const [tol, setTol] = useState(toleranceText(grade));
  const [distribution, setDistribution] = useState<"normal" | "uniform">(grade?.distribution ?? "normal");
  const [cost, setCost] = useState(grade ? String(grade.costEach) : "");
  const [errors, setErrors] = useState<Errors>({});
  const save = useSaveGrade();

  function submit(event: FormEvent) {
    event.preventDefault();
    const next: Errors = {};
    const t = readGradeTolerance(tol, kind);
    if (typeof t === "string") next.tolerance = t;
    else if (t.tolerance === undefined && !(t.toleranceAbs! > 0)) next.tolerance = "Give the grade a tolerance (1% or 0.25p).";
    if (!code.trim()) next.code = "Code is required.";
    if (!label.trim()) next.label = "Label is required.";
    const costEach = Number(cost);
    if (cost.trim() === "" || !(costEach >= 0)) next.costEach = "Cost each is a number ≥ 0.";
    setErrors(next);
    if (Object.keys(next).length || typeof t === "string") return;
    save.mutate({ id: grade?.id ?? null, data: { kind, code: code.trim(), label: label.trim(), distribution, costEach, ...t } }, { onSuccess: onDone });
  }

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-3">
      <label className="flex flex-col gap-1.5 text-sm font-semibold text-paper-200">
        Kind
        <select className={select} value={kind} onChange={(e) => setKind(e.target.value as PartKind)}>
          <option value="R">R — resistor</option>
          <option value="L">L — inductor</option>
          <option value="C">C — capacitor</option>
        </select>
      </label>
      <TextField label="Code" value={code} maxLength={40} onChange={(e) => setCode(e.target.value)} error={errors.code} hint="As written in the parts table, e.g. C0G-1" />
      <TextField label="Label" value={label} maxLength={120} onChange={(e) => setLabel(e.target.value)} error={errors.label} />
      <TextField label="Grade tolerance" value={tol} onChange={(e) => setTol(e.target.value)} error={errors.tolerance} hint="1% or an absolute value (0.25p)" />
      <label className="flex flex-col gap-1.5 text-sm font-semibold text-paper-200">
        Distribution
        <select className={select} value={distribution} onChange={(e) => setDistribution(e.target.value as "normal" | "uniform")}>
          <option value="normal">normal (tolerance = 3σ)</option>
          <option value="uniform">uniform</option>
        </select>
      </label>
      <TextField label="Cost each" inputMode="decimal" value={cost} onChange={(e) => setCost(e.target.value)} error={errors.costEach} />
      {save.error && <Alert tone="error">{save.error.message}</Alert>}
      <div className="flex gap-2">
        <Button type="submit" pending={save.isPending}>
          {grade ? "Save grade" : "Add grade"}
        </Button>
        {grade && (
          <Button variant="ghost" onClick={onDone}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
