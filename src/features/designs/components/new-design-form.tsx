import { useMemo, useState, type FormEvent } from "react";
import { useNavigate } from "react-router-dom";
import type { Netlist } from "@shared/engine/netlist";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { TextField } from "@/components/ui/text-field";
import { paths } from "@/config/paths";
import { splitApiError } from "@/lib/form";
import { useCreateDesign } from "@/features/designs/api/create-design";
import { DEFAULT_STRESS_CLASS, STRESS_CLASSES, STRESS_LABELS, type StressClass } from "@shared/contracts";
import { FileSource } from "@/features/designs/components/file-source";
import { NominalPlot } from "@/features/designs/components/nominal-plot";
import { PrototypeForm } from "@/features/designs/components/prototype-form";
import { SelectField } from "@/features/designs/components/select-field";
import { StressCaution } from "@/features/designs/components/stress-caution";
import { suggestSweep } from "@/features/designs/lib/nominal-response";
import { blankNetlist } from "@/features/designs/lib/read-netlist-file";
import { DEFAULT_PROTOTYPE, synthesizeFromText } from "@/features/designs/lib/prototype-spec";

type Source = "prototype" | "blank" | "file";
const SOURCES = [["prototype", "From a prototype"], ["blank", "Blank"], ["file", "From a file"]] as const;
const STRESS_OPTIONS = STRESS_CLASSES.map((s) => [s, STRESS_LABELS[s]] as const);

/** Name the design, pick how it starts (prototype, blank, file), preview it, create it as r1. */
export function NewDesignForm() {
  const navigate = useNavigate();
  const create = useCreateDesign();
  const [source, setSource] = useState<Source>("prototype");
  const [proto, setProto] = useState(DEFAULT_PROTOTYPE);
  const [fileNetlist, setFileNetlist] = useState<Netlist | null>(null);
  const [name, setName] = useState("");
  const [description, setDescription] = useState("");
  const [stress, setStress] = useState<StressClass>(DEFAULT_STRESS_CLASS);
  const [nameError, setNameError] = useState<string | undefined>();
  const synthesized = useMemo(() => synthesizeFromText(proto), [proto]);
  const netlist = source === "prototype" ? (synthesized.ok ? synthesized.netlist : null) : source === "blank" ? blankNetlist() : fileNetlist;
  const sweep = useMemo(() => (netlist ? suggestSweep(netlist) : { from: 1e6, to: 1e9, points: 201, scale: "log" as const }), [netlist]);
  const failure = create.error ? splitApiError(create.error) : null;

  function submit(event: FormEvent) {
    event.preventDefault();
    const finalName = name.trim() || netlist?.name || "";
    if (!finalName) return setNameError("Name the design.");
    if (!netlist) return;
    setNameError(undefined);
    create.mutate(
      { name: finalName, description: description || undefined, stress, netlist: { ...netlist, name: finalName }, sweep },
      { onSuccess: ({ design, revision }) => navigate(paths.app.design.getHref(design.id, revision.id)) },
    );
  }

  return (
    <form noValidate onSubmit={submit} className="flex flex-col gap-6">
      <Card title="Design">
        <div className="grid gap-4 md:grid-cols-3">
          <TextField label="Name" value={name} placeholder={netlist?.name ?? ""} maxLength={120} onChange={(e) => setName(e.target.value)} error={nameError} hint="Empty: the prototype's name" />
          <TextField label="Description" value={description} maxLength={2000} onChange={(e) => setDescription(e.target.value)} />
          <SelectField label="Use" value={stress} options={STRESS_OPTIONS} onChange={setStress} />
        </div>
        <div className="mt-4">
          <StressCaution stress={stress} />
        </div>
      </Card>
      <Card title="Start from" actions={<SelectField label="Source" value={source} options={SOURCES} onChange={setSource} />}>
        {source === "prototype" && <PrototypeForm value={proto} onChange={setProto} result={synthesized} />}
        {source === "prototype" && !synthesized.ok && synthesized.field === null && <Alert tone="error" className="mt-3">{synthesized.message}</Alert>}
        {source === "blank" && <p className="text-sm text-ink-300">One 100 nH inductor between two 50 Ω ports; add parts in the workspace.</p>}
        {source === "file" && <FileSource onNetlist={setFileNetlist} />}
      </Card>
      {netlist && (
        <Card title="Preview" description={`${netlist.parts.length} parts: ${netlist.parts.map((p) => p.ref).join(", ")}`}>
          <NominalPlot netlist={netlist} sweep={sweep} />
        </Card>
      )}
      {failure && (
        <Alert tone="error" title="Not created">
          {failure.message ?? Object.entries(failure.fields).map(([k, v]) => `${k}: ${v}`).join("; ")}
        </Alert>
      )}
      <div>
        <Button type="submit" disabled={!netlist} pending={create.isPending}>
          Create design
        </Button>
      </div>
    </form>
  );
}
