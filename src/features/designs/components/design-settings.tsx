import { useState, type FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/text-field";
import { useUpdateDesign } from "@/features/designs/api/update-design";
import { STRESS_CLASSES, STRESS_LABELS, type DesignView as Design, type StressClass } from "@shared/contracts";
import { SelectField } from "@/features/designs/components/select-field";

const OPTIONS = STRESS_CLASSES.map((s) => [s, STRESS_LABELS[s]] as const);

/** Rename the design, change its description or its use (designer). */
export function DesignSettings({ design, onDone }: { design: Design; onDone: () => void }) {
  const [name, setName] = useState(design.name);
  const [description, setDescription] = useState(design.description);
  const [stress, setStress] = useState<StressClass>(design.stress);
  const update = useUpdateDesign();

  function submit(event: FormEvent) {
    event.preventDefault();
    update.mutate({ id: design.id, data: { name: name.trim(), description, stress } }, { onSuccess: onDone });
  }

  return (
    <form noValidate onSubmit={submit} className="grid gap-3 md:grid-cols-[1fr_2fr_1fr_auto] md:items-end">
      <TextField label="Design name" value={name} maxLength={120} onChange={(e) => setName(e.target.value)} error={name.trim() ? undefined : "Name the design."} />
      <TextField label="Description" value={description} maxLength={2000} onChange={(e) => setDescription(e.target.value)} />
      <SelectField label="Use" value={stress} options={OPTIONS} onChange={setStress} />
      <div className="flex gap-2">
        <Button type="submit" disabled={!name.trim()} pending={update.isPending}>
          Save details
        </Button>
        <Button variant="ghost" onClick={onDone}>
          Cancel
        </Button>
      </div>
      {update.error && <Alert tone="error" className="md:col-span-4">{update.error.message}</Alert>}
    </form>
  );
}
