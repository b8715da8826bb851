import type { QueryClient } from "@tanstack/react-query";
import { Link, useParams, type LoaderFunctionArgs } from "react-router-dom";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { paths } from "@/config/paths";
import { getSweepQueryOptions, useSweep } from "@/features/sweeps/api/sweeps";
import { SweepTable } from "@/features/sweeps/components/sweep-table";
import { percent } from "@/features/runs/utils/format";
import { useQuery } from "@tanstack/react-query";
import { getDesignQueryOptions } from "@/features/designs";
import { SafetyCaution } from "@/features/runs/components/safety-caution";
import { isFinishedRunState } from "@shared/contracts";

export const clientLoader = (queryClient: QueryClient) => async ({ params }: LoaderFunctionArgs) => {
  void queryClient.prefetchQuery(getSweepQueryOptions(params.sweepId ?? ""));
  return null;
};

export default function SweepRoute() {
  const { sweepId = "" } = useParams();
  return (
    <RegionBoundary region="This sweep">
      <SweepPage sweepId={sweepId} />
    </RegionBoundary>
  );
}

function SweepPage({ sweepId }: { sweepId: string }) {
  const data = useSweep(sweepId).data;
  const pending = data.rows.filter((r) => !isFinishedRunState(r.state)).length;
  const cheapest = data.rows.find((r) => r.runId === data.cheapestMeetingTarget);
  const doneIds = data.rows.filter((r) => r.state === "done").map((r) => r.runId);
  const design = useQuery(getDesignQueryOptions(data.sweep.designId));
  return (
    <>
      <title>{`${data.sweep.name || "Grade sweep"} · Lotwise`}</title>
      <PageHeader title={data.sweep.name || "Grade sweep"} lead={`Target yield ${percent(data.sweep.targetYield, 1)}: an assignment meets it when the lower end of its 95 % interval does.`} />
      <div className="flex flex-col gap-4">
        <SafetyCaution stress={design.data?.design.stress} />
        {pending > 0 && <Alert tone="info">{pending} of {data.rows.length} runs still going; the table fills in as they finish.</Alert>}
        {pending === 0 && (cheapest ? (
          <Alert tone="success" title={`Cheapest assignment meeting the target: ${cheapest.label}`}>
            Yield {percent(cheapest.yield, 1)} at {cheapest.costPerGoodUnit?.toFixed(2)} per good unit.
          </Alert>
        ) : (
          <Alert tone="caution" title="No assignment meets the target">Tighten the grades of the parts that drive failures (see a run's sensitivity ranking), or revisit the limits.</Alert>
        ))}
        <Card
          title="Cost table"
          actions={doneIds.length >= 2 && <Link className="text-sm font-semibold text-signal-300 underline" to={paths.app.compare.getHref(doneIds.slice(0, 6))}>Compare these runs</Link>}
        >
          <SweepTable data={data} />
        </Card>
      </div>
    </>
  );
}
