import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { useParams, useSearchParams, type LoaderFunctionArgs } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { TextLink } from "@/components/ui/link";
import { paths } from "@/config/paths";
import { getDesignQueryOptions, useDesign } from "@/features/designs/api/get-design";
import { getRevisionQueryOptions, useRevision } from "@/features/designs/api/get-revision";
import { DesignSettings } from "@/features/designs/components/design-settings";
import { DesignWorkspace } from "@/features/designs/components/design-workspace";
import { getGradesQueryOptions, useGrades } from "@/features/grades/api/get-grades";
import { useLimitSets } from "@/features/limits/api/get-limit-sets";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async ({ params, request }: LoaderFunctionArgs) => {
  const designId = params.designId ?? "";
  void queryClient.prefetchQuery(getGradesQueryOptions());
  const revisionId = new URL(request.url).searchParams.get("revision");
  if (revisionId) void queryClient.prefetchQuery(getRevisionQueryOptions(revisionId));
  void queryClient.prefetchQuery(getDesignQueryOptions(designId));
  return null;
};

export default function DesignRoute() {
  const { designId = "" } = useParams();
  return (
    <RegionBoundary region="The design">
      <DesignPage designId={designId} />
    </RegionBoundary>
  );
}

function DesignPage({ designId }: { designId: string }) {
  const user = useAppUser();
  const { data: detail } = useDesign(designId);
  const [search] = useSearchParams();
  const [editing, setEditing] = useState(false);
  const newest = [...detail.revisions].sort((a, b) => b.number - a.number)[0];
  const revisionId = search.get("revision") ?? newest?.id;
  const isDesigner = hasAnyRole(user.roles, ACCESS.editDesigns);
  return (
    <>
      <title>{`${detail.design.name} · Lotwise`}</title>
      <PageHeader
        title={detail.design.name}
        lead={detail.design.description || `Owned by ${detail.design.owner.name}.`}
        actions={
          <div className="flex flex-wrap items-center gap-4 text-sm">
            <TextLink to={paths.app.designLimits.getHref(designId)}>Limits ({detail.limitSets.length})</TextLink>
            {revisionId && <TextLink to={paths.app.newRun.getHref({ design: designId, revision: revisionId })}>New run</TextLink>}
            {isDesigner && !editing && (
              <Button size="sm" variant="secondary" onClick={() => setEditing(true)}>
                Edit details
              </Button>
            )}
          </div>
        }
      />
      {editing && (
        <div className="mb-6">
          <DesignSettings design={detail.design} onDone={() => setEditing(false)} />
        </div>
      )}
      {revisionId ? (
        <RegionBoundary region="The revision">
          <RevisionView designId={designId} revisionId={revisionId} />
        </RegionBoundary>
      ) : (
        <Alert>This design has no revision yet.</Alert>
      )}
    </>
  );
}

function RevisionView({ designId, revisionId }: { designId: string; revisionId: string }) {
  const user = useAppUser();
  const { data: detail } = useDesign(designId);
  const { data: revision } = useRevision(revisionId);
  const { data: grades } = useGrades();
  const { data: limitSets } = useLimitSets(designId);
  const [maskId, setMaskId] = useState<string>("");
  const mask = limitSets.find((s) => s.id === maskId);
  return (
    <div className="flex flex-col gap-3">
      {limitSets.length > 0 && (
        <label className="flex items-center gap-2 self-end text-sm text-paper-200">
          Draw limits
          <select className="h-9 rounded-md border border-ink-600 bg-ink-950 px-2 text-sm" value={maskId} onChange={(e) => setMaskId(e.target.value)}>
            <option value="">none</option>
            {limitSets.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </select>
        </label>
      )}
      <DesignWorkspace
        key={revision.id}
        detail={detail}
        revision={revision}
        grades={grades.map((g) => ({ kind: g.kind, code: g.code, label: g.label }))}
        canEdit={hasAnyRole(user.roles, ACCESS.editDesigns)}
        canUploadMeasured={hasAnyRole(user.roles, ACCESS.uploadMeasured)}
        rules={mask?.limits.rules}
      />
    </div>
  );
}
