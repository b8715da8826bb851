import "@/print.css";
import type { QueryClient } from "@tanstack/react-query";
import { useQuery } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { paths } from "@/config/paths";
import { getDesignQueryOptions } from "@/features/designs";
import { getRunQueryOptions, useRun } from "@/features/runs/api/get-run";
import { RunReport } from "@/features/runs/components/run-report";
import { SafetyCaution } from "@/features/runs/components/safety-caution";
import { formatDateTime } from "@/utils/format";

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getRunQueryOptions(params.runId ?? ""));
  return null;
};

export default function RunReportRoute() {
  const { runId = "" } = useParams();
  return (
    <RegionBoundary region="The report">
      <ReportPage runId={runId} />
    </RegionBoundary>
  );
}

function ReportPage({ runId }: { runId: string }) {
  const { run, result, economics } = useRun(runId).data;
  const design = useQuery(getDesignQueryOptions(run.designId));
  return (
    <>
      <title>{`Report · ${run.designName} r${run.revisionNumber} · Lotwise`}</title>
      <header className="report mb-6 flex flex-wrap items-end justify-between gap-4">
        <div>
          <p className="text-xs uppercase tracking-wide text-ink-300">Lotwise run report</p>
          <h1 className="text-2xl font-semibold text-paper-50">{run.designName} · revision r{run.revisionNumber}</h1>
          <p className="text-sm text-ink-300">
            {run.label || "Monte Carlo run"} · run {run.id} · finished {run.finishedAt ? formatDateTime(run.finishedAt) : "—"}
          </p>
        </div>
        <div className="no-print flex items-center gap-3">
          <Link className="text-sm font-semibold text-signal-300 underline" to={paths.app.run.getHref(runId)}>Back to the run</Link>
          <Button onClick={() => window.print()}>Print</Button>
        </div>
      </header>
      {result ? (
        <RunReport run={run} result={result} economics={economics} caution={<SafetyCaution stress={run.designStress ?? design.data?.design.stress} />} />
      ) : (
        <Alert tone="info" title="No result yet">The report is ready once the run is done (it is {run.state}).</Alert>
      )}
    </>
  );
}
