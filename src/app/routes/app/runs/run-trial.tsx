import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { paths } from "@/config/paths";
import { getRunQueryOptions, useRun } from "@/features/runs/api/get-run";
import { getTrialQueryOptions, useTrial } from "@/features/runs/api/get-trial";
import { TrialReplayView } from "@/features/runs/components/trial-replay";
import { SafetyCaution } from "@/features/runs/components/safety-caution";

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getRunQueryOptions(params.runId ?? ""));
  void queryClient.prefetchQuery(getTrialQueryOptions(params.runId ?? "", Number(params.index)));
  return null;
};

export default function RunTrialRoute() {
  const { runId = "", index = "0" } = useParams();
  return (
    <RegionBoundary region="This trial">
      <TrialPage runId={runId} index={Number(index)} />
    </RegionBoundary>
  );
}

function TrialPage({ runId, index }: { runId: string; index: number }) {
  const { run, result } = useRun(runId).data;
  const trial = useTrial(runId, index).data;
  const nominal = result?.nominal ?? Object.fromEntries((result?.envelopes.series ?? []).map((s) => [s.metric.replace("_db", ""), s.nominal]));
  const failing = result?.failingTrials ?? [];
  const at = failing.indexOf(index);
  const link = "text-sm font-semibold text-signal-300 underline";
  return (
    <>
      <title>{`Trial ${index} · ${run.designName} · Lotwise`}</title>
      <PageHeader
        title={`Trial ${index} of ${run.designName} r${run.revisionNumber}`}
        lead={`Replayed from seed ${String(run.seed)}: the same draw every time.`}
        actions={
          <nav className="flex flex-wrap items-center gap-4" aria-label="Trial">
            <Link className={link} to={paths.app.run.getHref(runId)}>Back to the run</Link>
            {at > 0 && <Link className={link} to={paths.app.runTrial.getHref(runId, failing[at - 1])}>Previous failing</Link>}
            {at >= 0 && at < failing.length - 1 && <Link className={link} to={paths.app.runTrial.getHref(runId, failing[at + 1])}>Next failing</Link>}
            <a className={link} href={`/api/runs/${encodeURIComponent(runId)}/trials/${index}.s2p`} download>Trial .s2p</a>
          </nav>
        }
      />
      <div className="mb-6">
        <SafetyCaution stress={run.designStress ?? undefined} />
      </div>
      <TrialReplayView trial={trial} rules={run.limits.rules} nominal={nominal} />
    </>
  );
}
