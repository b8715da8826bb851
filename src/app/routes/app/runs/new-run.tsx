import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { getDesignsQueryOptions } from "@/features/designs";
import { getGradesQueryOptions } from "@/features/grades";
import { LaunchForm } from "@/features/runs/components/launch-form";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getDesignsQueryOptions());
  void queryClient.prefetchQuery(getGradesQueryOptions());
  return null;
};

export default function NewRunRoute() {
  const user = useAppUser();
  const [search] = useSearchParams();
  if (!hasAnyRole(user.roles, ACCESS.launchRuns)) return <ForbiddenNotice screen="New run" role="designer, planner or analyst" />;
  const initial = { designId: search.get("design") ?? "", revisionId: search.get("revision") ?? "", limitSetId: search.get("limitSet") ?? "" };
  return (
    <>
      <title>New run · Lotwise</title>
      <PageHeader title="New run" lead="Builds the lot many times over in the computer, with every part drawn inside its tolerance, and counts how many pass the limits." />
      <Card>
        <RegionBoundary region="The run form">
          <LaunchForm initial={initial} />
        </RegionBoundary>
      </Card>
    </>
  );
}
