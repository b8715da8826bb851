import type { ReactNode } from "react";
import { Card } from "@/components/ui/card";
import type { MeasuredChoice } from "@/features/runs/components/envelope-panel";
import type { RunEconomics as Economics, RunDetail, RunResultView as RunResultJson } from "@shared/contracts";
import { CpkTable } from "@/features/runs/components/cpk-table";
import { EconomicsPanel } from "@/features/runs/components/economics-panel";
import { EnvelopePanel } from "@/features/runs/components/envelope-panel";
import { ExportLinks } from "@/features/runs/components/export-links";
import { FailingTrials } from "@/features/runs/components/failing-trials";
import { FailurePareto } from "@/features/runs/components/failure-pareto";
import { MarginHistograms } from "@/features/runs/components/margin-histograms";
import { SensitivityRanking } from "@/features/runs/components/sensitivity-ranking";
import { YieldHeadline } from "@/features/runs/components/yield-headline";

export type RunDashboardProps = {
  run: RunDetail;
  result: RunResultJson;
  economics: Economics | null;
  measured: MeasuredChoice[];
  /** The safety caution for the design's stress class. */
  caution: ReactNode;
  /** Extra panels at the foot (what-if, comments, review), composed by the route. */
  children?: ReactNode;
};

/** A finished run: yield first, then why trials fail, the spread, the money and the trials to replay. */
export function RunDashboard({ run, result, economics, measured, caution, children }: RunDashboardProps) {
  return (
    <div className="flex flex-col gap-6">
      <Card>
        <div className="flex flex-col gap-5">
          <YieldHeadline result={result} />
          <ExportLinks runId={run.id} trials={result.trials} />
        </div>
      </Card>
      {caution}
      <div className="grid gap-6 xl:grid-cols-2">
        <FailurePareto result={result} />
        <CpkTable result={result} />
      </div>
      <EnvelopePanel result={result} rules={run.limits.rules} measured={measured} />
      <MarginHistograms result={result} />
      <div className="grid gap-6 xl:grid-cols-2">
        <SensitivityRanking result={result} />
        <EconomicsPanel economics={economics} />
      </div>
      <FailingTrials runId={run.id} trials={result.failingTrials} />
      {children}
    </div>
  );
}
