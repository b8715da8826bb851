import { useCallback, useState, type FormEvent } from "react";
import { useNavigate } from "react-router-dom";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { paths } from "@/config/paths";
import { useCreateRun } from "@/features/runs/api/create-run";
import { useRevisionIfAny as useRevision } from "@/features/designs";
import { useGrades } from "@/features/grades";
import { GradeOverridesEditor } from "@/features/runs/components/grade-overrides-editor";
import { TargetPicker, type RunTarget } from "@/features/runs/components/target-picker";
import { checkInteger, parseCorners, randomSeed } from "@/features/runs/utils/launch-input";

type Errors = Partial<Record<"trials" | "seed" | "target" | "corners" | "limitSetId", string>>;

/** New run: what to run (revision, limit set), how many trials, the seed, stop-when-sure, corners, grades. */
export function LaunchForm({ initial }: { initial: RunTarget }) {
  const [target, setTarget] = useState(initial);
  const [trials, setTrials] = useState("2000");
  const [seed, setSeed] = useState(() => String(randomSeed()));
  const [targetPct, setTargetPct] = useState("");
  const [corners, setCorners] = useState("");
  const [label, setLabel] = useState("");
  const [overrides, setOverrides] = useState<Record<string, string>>({});
  const [errors, setErrors] = useState<Errors>({});
  const revision = useRevision(target.revisionId || null);
  const grades = useGrades();
  const create = useCreateRun();
  const navigate = useNavigate();
  const onTarget = useCallback((next: RunTarget) => {
    setTarget(next);
    if (next.revisionId !== target.revisionId) setOverrides({});
  }, [target.revisionId]);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const parsedCorners = parseCorners(corners);
    const half = targetPct.trim() ? Number(targetPct) / 100 : undefined;
    const next: Errors = {
      trials: checkInteger(trials, 1, 1_000_000, "Trials"),
      seed: checkInteger(seed, 0, 2147483647, "Seed"),
      target: half !== undefined && !(half > 0 && half < 0.5) ? "Give a half-width between 0 and 50 %." : undefined,
      corners: parsedCorners.error,
      limitSetId: target.limitSetId ? undefined : "Pick a limit set.",
    };
    setErrors(next);
    if (Object.values(next).some(Boolean) || !target.revisionId) return;
    create.mutate(
      { revisionId: target.revisionId, limitSetId: target.limitSetId, trials: Number(trials), seed: Number(seed), targetHalfWidth: half,
        corners: parsedCorners.corners, gradeOverrides: Object.keys(overrides).length ? overrides : undefined, label: label.trim() || undefined },
      { onSuccess: (run) => navigate(paths.app.run.getHref(run.id)) },
    );
  };

  return (
    <form onSubmit={submit} className="flex flex-col gap-6" aria-label="New run" noValidate>
      <TargetPicker value={target} onChange={onTarget} />
      {errors.limitSetId && <Alert tone="error">{errors.limitSetId}</Alert>}
      <div className="grid gap-4 md:grid-cols-3">
        <TextField label="Trials" inputMode="numeric" value={trials} onChange={(e) => setTrials(e.target.value)} error={errors.trials} hint="1 to 1,000,000; each trial is one built filter." />
        <div className="flex items-end gap-2">
          <TextField className="flex-1" label="Seed" inputMode="numeric" value={seed} onChange={(e) => setSeed(e.target.value)} error={errors.seed} hint="The same seed gives the same trials." />
          <Button variant="ghost" size="sm" className="mb-6" onClick={() => setSeed(String(randomSeed()))}>New seed</Button>
        </div>
        <TextField label="Stop when sure (± %)" inputMode="decimal" placeholder="off" value={targetPct} onChange={(e) => setTargetPct(e.target.value)} error={errors.target} hint="Stops once the 95 % interval is this narrow." />
        <TextField label="Temperature corners (°C)" placeholder="25" value={corners} onChange={(e) => setCorners(e.target.value)} error={errors.corners} hint="e.g. −40, 25, 85: a trial must pass at every corner." />
        <TextField className="md:col-span-2" label="Label (optional)" value={label} onChange={(e) => setLabel(e.target.value)} maxLength={160} />
      </div>
      {revision.data && revision.data.netlist.parts.length > 0 && (
        <section aria-label="Grade overrides" className="flex flex-col gap-2">
          <h3 className="text-sm font-semibold text-paper-100">Grades for this run</h3>
          <GradeOverridesEditor parts={revision.data.netlist.parts} grades={grades.data} value={overrides} onChange={setOverrides} />
        </section>
      )}
      {create.isError && <Alert tone="error" title="The run was not queued">{create.error.message}</Alert>}
      <div>
        <Button type="submit" pending={create.isPending} disabled={!target.revisionId}>Launch run</Button>
      </div>
    </form>
  );
}
