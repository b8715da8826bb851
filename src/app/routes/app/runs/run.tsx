import type { QueryClient } from "@tanstack/react-query";
import { useQuery } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import { paths } from "@/config/paths";
import { CommentsPanel } from "@/features/review/components/comments-panel";
import { ReviewPanel } from "@/features/review/components/review-panel";
import { getDesignQueryOptions } from "@/features/designs";
import { getRunQueryOptions, useRun } from "@/features/runs/api/get-run";
import { isFinishedRunState as isFinished } from "@shared/contracts";
import { RunDashboard } from "@/features/runs/components/run-dashboard";
import { RunFacts } from "@/features/runs/components/run-facts";
import { RunProgressPanel } from "@/features/runs/components/run-progress";
import { SafetyCaution } from "@/features/runs/components/safety-caution";
import { WhatIfForm } from "@/features/runs/components/what-if-form";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getRunQueryOptions(params.runId ?? ""));
  return null;
};

export default function RunRoute() {
  const { runId = "" } = useParams();
  return (
    <RegionBoundary region="This run">
      <RunPage runId={runId} />
    </RegionBoundary>
  );
}

function RunPage({ runId }: { runId: string }) {
  const user = useAppUser();
  const { data } = useRun(runId);
  const { run, result, economics } = data;
  const design = useQuery(getDesignQueryOptions(run.designId));
  const canLaunch = hasAnyRole(user.roles, ACCESS.launchRuns);
  const caution = <SafetyCaution stress={run.designStress ?? design.data?.design.stress} />;
  const measured = design.data?.measured.map((m) => ({ id: m.id, name: m.name })) ?? [];

  return (
    <>
      <title>{`${run.designName} r${run.revisionNumber} run · Lotwise`}</title>
      <PageHeader
        title={`${run.designName} · r${run.revisionNumber}`}
        lead={run.label || "Monte Carlo run"}
        actions={<Badge tone={run.state === "done" ? "pass" : run.state === "failed" ? "fault" : "signal"}>{run.state}</Badge>}
      />
      <div className="flex flex-col gap-6">
        {run.state !== "done" && caution}
        <Card title="Inputs">
          <RunFacts run={run} />
        </Card>
        {!isFinished(run.state) && (
          <Card title="Progress">
            <RunProgressPanel run={run} canCancel={canLaunch} />
          </Card>
        )}
        {run.state === "failed" && <Alert tone="error" title={`The run failed (${run.errorCode ?? "error"})`}>{run.errorMessage}</Alert>}
        {run.state === "cancelled" && <Alert tone="info" title="The run was cancelled">No result was stored. Launch it again from <Link className="underline" to={paths.app.newRun.getHref({ revision: run.revisionId, limitSet: run.limitSetId ?? undefined, design: run.designId })}>New run</Link>.</Alert>}
        {run.state === "done" && result && (
          <RunDashboard run={run} result={result} economics={economics} measured={measured} caution={caution}>
            {canLaunch && <WhatIfForm run={run} />}
          </RunDashboard>
        )}
        <div className="grid gap-6 xl:grid-cols-2">
          <Card title="Comments">
            <RegionBoundary region="Comments">
              <CommentsPanel runId={run.id} />
            </RegionBoundary>
          </Card>
          <Card title="Sign-off">
            <RegionBoundary region="The sign-off">
              <ReviewPanel revisionId={run.revisionId} revisionNumber={run.revisionNumber} roles={user.roles} />
            </RegionBoundary>
          </Card>
        </div>
      </div>
    </>
  );
}
