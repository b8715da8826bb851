import { useState, type FormEvent } from "react";
import { useNavigate } from "react-router-dom";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { TextField } from "@/components/ui/text-field";
import { paths } from "@/config/paths";
import { useCreateRun } from "@/features/runs/api/create-run";
import type { RunDetail } from "@shared/contracts";

/** Rerun the same inputs and seed with one part's tolerance changed, labelled "what if C3 ±1 %". */
export function WhatIfForm({ run }: { run: RunDetail }) {
  const parts = run.netlist.parts;
  const [ref, setRef] = useState(parts[0]?.ref ?? "");
  const [tolerancePct, setTolerancePct] = useState("1");
  const [error, setError] = useState<string>();
  const create = useCreateRun();
  const navigate = useNavigate();

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const pct = Number(tolerancePct);
    if (!Number.isFinite(pct) || pct < 0 || pct > 50) return setError("Enter a tolerance between 0 and 50 %.");
    setError(undefined);
    if (!run.limitSetId) return setError("The run's limit set no longer exists.");
    create.mutate(
      {
        revisionId: run.revisionId,
        limitSetId: run.limitSetId,
        trials: run.trialsTotal,
        seed: typeof run.seed === "number" ? run.seed : undefined,
        corners: run.options.corners,
        targetHalfWidth: run.options.targetHalfWidth,
        gradeOverrides: run.gradeOverrides,
        toleranceOverrides: { [ref]: { tolerance: pct / 100 } },
        label: `what if ${ref} ±${pct} %`,
      },
      { onSuccess: (created) => navigate(paths.app.run.getHref(created.id)) },
    );
  };

  if (parts.length === 0) return null;
  const current = parts.find((p) => p.ref === ref);
  return (
    <Card title="What if" description="The same inputs and seed, with one part's tolerance changed; the new run opens when queued.">
      <form onSubmit={submit} className="flex flex-wrap items-end gap-3" aria-label="What if">
        <label className="flex flex-col gap-1.5 text-sm font-semibold text-paper-200">
          Part
          <select className="h-10 rounded-md border border-ink-600 bg-ink-950 px-2 font-mono text-sm text-paper-50" value={ref} onChange={(e) => setRef(e.target.value)}>
            {parts.map((p) => (
              <option key={p.ref} value={p.ref}>{p.ref}</option>
            ))}
          </select>
        </label>
        <TextField label="New tolerance (± %)" inputMode="decimal" value={tolerancePct} onChange={(e) => setTolerancePct(e.target.value)} error={error} className="w-44"
          hint={current?.tolerance !== undefined ? `now ±${(current.tolerance * 100).toFixed(2)} %` : undefined} />
        <Button type="submit" variant="secondary" pending={create.isPending}>
          Rerun with this change
        </Button>
      </form>
      {create.isError && <Alert tone="error" className="mt-3">{create.error.message}</Alert>}
    </Card>
  );
}
