import { useState, type FormEvent } from "react";
import { parseSi } from "@shared/units";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { useForm } from "@/hooks/use-form";
import { validateWith } from "@/lib/form";
import { computeLimitsSchema, useComputeLimits, useSaveComputeLimits } from "@/features/settings/api/compute-limits";

/** Reads "2e10", "20G" or "20 000 000 000" as a number; anything else stays NaN for the schema to name. */
function readNumber(text: string): number {
  try {
    return parseSi(text.replace(/[\s_,](?=\d{3})/g, ""));
  } catch {
    return Number.NaN;
  }
}

const show = (x: number) => (x >= 1e6 ? x.toExponential().replace("e+", "e") : String(x));

/**
 * What one run or export may cost, in part evaluations (trials × corners × frequency points × parts), and how long
 * one replay or export may compute. A run over the limit is refused when it is launched, naming the most trials
 * its circuit may have.
 */
export function ComputeLimitsForm() {
  const { limits, defaults } = useComputeLimits().data;
  const form = useForm({
    maxRunCost: show(limits.maxRunCost), maxTrialCost: show(limits.maxTrialCost), maxExportCost: show(limits.maxExportCost), maxExportSeconds: String(limits.maxExportSeconds),
  });
  const save = useSaveComputeLimits();
  const [saved, setSaved] = useState(false);

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setSaved(false);
    const values = {
      maxRunCost: readNumber(form.values.maxRunCost), maxTrialCost: readNumber(form.values.maxTrialCost),
      maxExportCost: readNumber(form.values.maxExportCost), maxExportSeconds: readNumber(form.values.maxExportSeconds),
    };
    const parsed = validateWith(computeLimitsSchema, values);
    if (!parsed.ok) return form.showErrors(parsed.errors);
    form.showErrors({});
    save.mutate(parsed.data, { onSuccess: () => setSaved(true), onError: (error) => form.showApiError(error) });
  }

  return (
    <form noValidate onSubmit={handleSubmit} className="flex flex-col gap-4">
      <div className="grid gap-4 md:grid-cols-2 xl:grid-cols-4">
        <TextField label="Most a run may cost" inputMode="decimal" hint={`part evaluations; default ${show(defaults.maxRunCost)}`} {...form.bind("maxRunCost")} error={form.errors.maxRunCost} />
        <TextField label="Most one trial may cost" inputMode="decimal" hint={`part evaluations; default ${show(defaults.maxTrialCost)}`} {...form.bind("maxTrialCost")} error={form.errors.maxTrialCost} />
        <TextField label="Most an export may cost" inputMode="decimal" hint={`part evaluations; default ${show(defaults.maxExportCost)}`} {...form.bind("maxExportCost")} error={form.errors.maxExportCost} />
        <TextField label="Time budget of a replay or export" inputMode="numeric" hint={`seconds; default ${defaults.maxExportSeconds}`} {...form.bind("maxExportSeconds")} error={form.errors.maxExportSeconds} />
      </div>
      <p className="text-xs text-ink-300">
        A part evaluation is one part at one frequency point, temperature corner and trial. One thread does about 2.5 to 25 million a second
        (large circuits are slower per part), so the default run limit is a quarter of an hour to a few hours of one thread. A thread
        works on a whole trial at a time, so the trial limit bounds how long someone else's run waits for a thread.
      </p>
      {form.formError && <Alert tone="error" title="Not saved">{form.formError}</Alert>}
      {saved && <p role="status" className="text-sm text-pass-300">Compute limits saved.</p>}
      <div>
        <Button type="submit" pending={save.isPending}>Save limits</Button>
      </div>
    </form>
  );
}
