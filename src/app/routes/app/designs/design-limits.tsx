import { useCallback, useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { useNavigate, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import type { LimitRule } from "@shared/engine/limits";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { TextLink } from "@/components/ui/link";
import { paths } from "@/config/paths";
import { getDesignQueryOptions, useDesign } from "@/features/designs/api/get-design";
import { useRevision } from "@/features/designs/api/get-revision";
import { NominalPlot } from "@/features/designs/components/nominal-plot";
import { StressCaution } from "@/features/designs/components/stress-caution";
import { getLimitSetsQueryOptions, useLimitSets } from "@/features/limits/api/get-limit-sets";
import { useDeleteLimitSet } from "@/features/limits/api/save-limit-set";
import { LimitSetEditor } from "@/features/limits/components/limit-set-editor";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getDesignQueryOptions(params.designId ?? ""));
  void queryClient.prefetchQuery(getLimitSetsQueryOptions(params.designId ?? ""));
  return null;
};

export default function DesignLimitsRoute() {
  const { designId = "" } = useParams();
  return (
    <RegionBoundary region="The limits">
      <LimitsPage designId={designId} />
    </RegionBoundary>
  );
}

function LimitsPage({ designId }: { designId: string }) {
  const user = useAppUser();
  const navigate = useNavigate();
  const [search] = useSearchParams();
  const { data: detail } = useDesign(designId);
  const { data: sets } = useLimitSets(designId);
  const remove = useDeleteLimitSet(designId);
  const [rules, setRules] = useState<LimitRule[]>([]);
  const onRulesChange = useCallback((next: LimitRule[]) => setRules(next), []);
  const [createdId, setCreatedId] = useState<string | null>(null);
  const selectedId = search.get("set") ?? sets[0]?.id ?? "new";
  const selected = sets.find((s) => s.id === selectedId) ?? null;
  const newest = [...detail.revisions].sort((a, b) => b.number - a.number)[0];
  const canEdit = hasAnyRole(user.roles, ACCESS.editLimits);
  const go = (id: string) => navigate(paths.app.designLimits.getHref(designId, id), { replace: true });

  return (
    <>
      <title>{`Limits · ${detail.design.name} · Lotwise`}</title>
      <PageHeader
        title={`Limits — ${detail.design.name}`}
        lead="Acceptance rules the test station applies to every built filter, drawn as a mask over the nominal response of the latest revision."
        actions={<TextLink to={paths.app.design.getHref(designId)}>Back to the design</TextLink>}
      />
      <div className="mb-4">
        <StressCaution stress={detail.design.stress} />
      </div>
      <div className="grid gap-6 2xl:grid-cols-2">
        <Card
          title="Limit set"
          actions={
            <div className="flex items-center gap-2">
              <select aria-label="Limit set" className="h-9 rounded-md border border-ink-600 bg-ink-950 px-2 text-sm" value={selected ? selected.id : "new"} onChange={(e) => go(e.target.value)}>
                {sets.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
                {canEdit && <option value="new">+ New limit set</option>}
              </select>
              {canEdit && selected && (
                <Button size="sm" variant="danger" pending={remove.isPending} onClick={() => remove.mutate(selected.id, { onSuccess: () => go("new") })}>
                  Delete
                </Button>
              )}
            </div>
          }
        >
          {selected || canEdit ? (
            <LimitSetEditor key={selected?.id ?? "new"} designId={designId} limitSet={selected} canEdit={canEdit} onRulesChange={onRulesChange} justSaved={createdId !== null && createdId === selected?.id} onSaved={(s) => { if (!selected) setCreatedId(s.id); go(s.id); }} />
          ) : (
            <p className="text-sm text-ink-300">No limit sets yet; a planner adds them.</p>
          )}
        </Card>
        <Card title="Nominal response with the mask" description={newest ? `r${newest.number}, computed in your browser.` : undefined}>
          {newest ? (
            <RegionBoundary region="The nominal response">
              <MaskedPlot revisionId={newest.id} rules={rules} />
            </RegionBoundary>
          ) : (
            <p className="text-sm text-ink-300">No revision to draw.</p>
          )}
        </Card>
      </div>
    </>
  );
}

function MaskedPlot({ revisionId, rules }: { revisionId: string; rules: LimitRule[] }) {
  const { data: revision } = useRevision(revisionId);
  return <NominalPlot netlist={revision.netlist} sweep={revision.sweep} rules={rules} />;
}
