import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams } from "react-router-dom";
import { hasAnyRole } from "@shared/roles";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { getDesignsQueryOptions, getGradesQueryOptions } from "@/features/runs/api/get-launch-data";
import { SweepForm } from "@/features/sweeps/components/sweep-form";
import { useAppUser } from "@/app/routes/app/app-context";
import { SWEEP_ROLES } from "@/app/routes/app/runs/roles";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getDesignsQueryOptions());
  void queryClient.prefetchQuery(getGradesQueryOptions());
  return null;
};

export default function NewSweepRoute() {
  const user = useAppUser();
  const [search] = useSearchParams();
  if (!hasAnyRole(user.roles, SWEEP_ROLES)) return <ForbiddenNotice screen="Grade sweep" role="analyst" />;
  return (
    <>
      <title>New grade sweep · Lotwise</title>
      <PageHeader title="New grade sweep" lead="Runs the same revision once per grade assignment, with shared random numbers, and finds the cheapest that meets the target yield." />
      <Card>
        <RegionBoundary region="The sweep form">
          <SweepForm initial={{ designId: search.get("design") ?? "", revisionId: search.get("revision") ?? "", limitSetId: search.get("limitSet") ?? "" }} />
        </RegionBoundary>
      </Card>
    </>
  );
}
