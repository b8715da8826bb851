import { useCallback, useEffect, useState, type FormEvent } from "react";
import { useNavigate } from "react-router-dom";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { paths } from "@/config/paths";
import { useRevisionIfAny as useRevision } from "@/features/designs";
import { useGrades } from "@/features/grades";
import { checkInteger, randomSeed, TargetPicker, type RunTarget } from "@/features/runs";
import { useCreateSweep, type Assignment } from "@/features/sweeps/api/sweeps";
import { AssignmentsEditor } from "@/features/sweeps/components/assignments-editor";
import { defaultAssignments } from "@/features/sweeps/utils";

/** Grade sweep: one revision, one limit set, one seed, several grade assignments and a target yield. */
export function SweepForm({ initial }: { initial: RunTarget }) {
  const [target, setTarget] = useState(initial);
  const [name, setName] = useState("");
  const [trials, setTrials] = useState("2000");
  const [seed, setSeed] = useState(() => String(randomSeed()));
  const [targetPct, setTargetPct] = useState("95");
  const [assignments, setAssignments] = useState<Assignment[]>([]);
  const [errors, setErrors] = useState<Record<string, string | undefined>>({});
  const revision = useRevision(target.revisionId || null);
  const grades = useGrades();
  const create = useCreateSweep();
  const navigate = useNavigate();
  const onTarget = useCallback((next: RunTarget) => setTarget(next), []);

  useEffect(() => {
    if (revision.data) setAssignments(defaultAssignments(revision.data.netlist.parts, grades.data));
  }, [revision.data, grades.data]);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const yieldTarget = Number(targetPct) / 100;
    const next = {
      trials: checkInteger(trials, 1, 1_000_000, "Trials"),
      seed: checkInteger(seed, 0, 2147483647, "Seed"),
      target: targetPct.trim() && yieldTarget >= 0 && yieldTarget <= 1 ? undefined : "Give a target between 0 and 100 %.",
      assignments: assignments.length === 0 ? "Add at least one assignment." : assignments.some((a) => !a.label.trim()) ? "Every assignment needs a label." : undefined,
      limitSetId: target.limitSetId ? undefined : "Pick a limit set.",
    };
    setErrors(next);
    if (Object.values(next).some(Boolean) || !target.revisionId) return;
    create.mutate(
      { revisionId: target.revisionId, limitSetId: target.limitSetId, trials: Number(trials), seed: Number(seed), targetYield: yieldTarget, name: name.trim() || undefined,
        assignments: assignments.map((a) => ({ label: a.label.trim(), gradeOverrides: a.gradeOverrides })) },
      { onSuccess: ({ sweep }) => navigate(paths.app.sweep.getHref(sweep.id)) },
    );
  };

  return (
    <form onSubmit={submit} className="flex flex-col gap-6" aria-label="New grade sweep" noValidate>
      <TargetPicker value={target} onChange={onTarget} />
      <div className="grid gap-4 md:grid-cols-4">
        <TextField label="Sweep name (optional)" value={name} onChange={(e) => setName(e.target.value)} maxLength={160} />
        <TextField label="Trials per assignment" inputMode="numeric" value={trials} onChange={(e) => setTrials(e.target.value)} error={errors.trials} />
        <TextField label="Shared seed" inputMode="numeric" value={seed} onChange={(e) => setSeed(e.target.value)} error={errors.seed} hint="Every assignment draws the same random numbers." />
        <TextField label="Target yield (%)" inputMode="decimal" value={targetPct} onChange={(e) => setTargetPct(e.target.value)} error={errors.target} hint="Met when the interval's lower bound reaches it." />
      </div>
      {revision.data && (
        <section aria-label="Assignments" className="flex flex-col gap-2">
          <h3 className="text-sm font-semibold text-paper-100">Grade assignments</h3>
          <AssignmentsEditor parts={revision.data.netlist.parts} grades={grades.data} value={assignments} onChange={setAssignments} />
        </section>
      )}
      {(errors.assignments || errors.limitSetId) && <Alert tone="error">{errors.assignments ?? errors.limitSetId}</Alert>}
      {create.isError && <Alert tone="error" title="The sweep was not launched">{create.error.message}</Alert>}
      <div>
        <Button type="submit" pending={create.isPending} disabled={!target.revisionId}>Launch sweep</Button>
      </div>
    </form>
  );
}
