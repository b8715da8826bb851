import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { getDesignsQueryOptions } from "@/features/designs";
import { getGradesQueryOptions } from "@/features/grades";
import { SweepForm } from "@/features/sweeps/components/sweep-form";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getDesignsQueryOptions());
  void queryClient.prefetchQuery(getGradesQueryOptions());
  return null;
};

export default function NewSweepRoute() {
  const user = useAppUser();
  const [search] = useSearchParams();
  if (!hasAnyRole(user.roles, ACCESS.launchSweeps)) return <ForbiddenNotice screen="Grade sweep" role="analyst" />;
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
