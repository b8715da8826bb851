import { useSearchParams } from "react-router-dom";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Alert } from "@/components/ui/alert";
import { Card } from "@/components/ui/card";
import { useCompare } from "@/features/compare/api/get-compare";
import { CompareCharts } from "@/features/compare/components/compare-charts";
import { CompareSummary } from "@/features/compare/components/compare-summary";
import { RunHistory } from "@/features/history/components/run-history";
import { chartColors } from "@/features/runs/components/charts/theme";
import { useAppUser } from "@/app/routes/app/app-context";
import { SafetyCaution } from "@/features/runs/components/safety-caution";

export default function CompareRoute() {
  const user = useAppUser();
  const [search] = useSearchParams();
  const ids = (search.get("runs") ?? "").split(",").filter(Boolean).slice(0, 6);
  return (
    <>
      <title>Compare · Lotwise</title>
      <PageHeader title="Compare" lead="Two to six finished runs side by side: yield, failures per rule, spreads and margins overlaid." />
      {ids.length < 2 ? (
        <div className="flex flex-col gap-4">
          <Alert tone="info">Tick two to six finished runs below, then “Compare selected”.</Alert>
          <Card>
            <RegionBoundary region="Run history">
              <RunHistory userId={user.id} />
            </RegionBoundary>
          </Card>
        </div>
      ) : (
        <RegionBoundary region="The comparison">
          <Comparison ids={ids} />
        </RegionBoundary>
      )}
    </>
  );
}

function Comparison({ ids }: { ids: string[] }) {
  const entries = useCompare(ids).data;
  const stresses = entries.map((e) => e.run.designStress);
  const stress = stresses.find((x) => x === "mains") ?? stresses.find((x) => x === "high-power-rf") ?? undefined;
  return (
    <div className="flex flex-col gap-6">
      <SafetyCaution stress={stress} />
      <Card>
        <CompareSummary entries={entries} colors={chartColors.series} />
      </Card>
      <CompareCharts entries={entries} colors={chartColors.series} />
    </div>
  );
}
