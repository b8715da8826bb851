import { useEffect } from "react";
import { useQuery } from "@tanstack/react-query";
import { getDesignQueryOptions, useDesigns } from "@/features/designs";
import { Select } from "@/features/runs/components/select";

export type RunTarget = { designId: string; revisionId: string; limitSetId: string };

/** Design → revision → limit set pickers; picks the newest revision and the first limit set by default. */
export function TargetPicker({ value, onChange }: { value: RunTarget; onChange: (next: RunTarget) => void }) {
  const designs = useDesigns();
  const detail = useQuery({ ...getDesignQueryOptions(value.designId), enabled: Boolean(value.designId) });
  const revisions = detail.data?.revisions ?? [];
  const limitSets = detail.data?.limitSets ?? [];

  useEffect(() => {
    if (!value.designId && designs.data[0]) onChange({ designId: designs.data[0].id, revisionId: "", limitSetId: "" });
  }, [value.designId, designs.data, onChange]);

  useEffect(() => {
    if (!detail.data) return;
    const revisionOk = revisions.some((r) => r.id === value.revisionId);
    const limitOk = limitSets.some((l) => l.id === value.limitSetId);
    if (revisionOk && limitOk) return;
    const newest = [...revisions].sort((a, b) => b.number - a.number)[0];
    const next = { ...value, revisionId: revisionOk ? value.revisionId : (newest?.id ?? ""), limitSetId: limitOk ? value.limitSetId : (limitSets[0]?.id ?? "") };
    if (next.revisionId !== value.revisionId || next.limitSetId !== value.limitSetId) onChange(next);
  }, [detail.data, revisions, limitSets, value, onChange]);

  return (
    <div className="grid gap-4 md:grid-cols-3">
      <Select label="Design" value={value.designId} onChange={(designId) => onChange({ designId, revisionId: "", limitSetId: "" })}
        options={designs.data.map((d) => ({ value: d.id, label: d.name }))} />
      <Select label="Revision" value={value.revisionId} onChange={(revisionId) => onChange({ ...value, revisionId })}
        options={revisions.map((r) => ({ value: r.id, label: `r${r.number}${r.note ? ` — ${r.note}` : ""}` }))} />
      <Select label="Limit set" value={value.limitSetId} onChange={(limitSetId) => onChange({ ...value, limitSetId })}
        options={limitSets.map((l) => ({ value: l.id, label: `${l.name} (${l.ruleCount} rules, lot ${l.lotSize.toLocaleString()})` }))}
        error={detail.data && limitSets.length === 0 ? "This design has no limit set yet: a planner adds one under Limits." : undefined} />
    </div>
  );
}
