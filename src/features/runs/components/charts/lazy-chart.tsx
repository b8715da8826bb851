import { lazy, Suspense } from "react";
import type { EChartProps } from "@/features/runs/components/charts/echart";
import { LoadingRegion } from "@/components/ui/spinner";

const EChart = lazy(() => import("@/features/runs/components/charts/echart"));

/** A chart loaded on first use (its ECharts chunk is fetched once, then cached). */
export function LazyChart(props: EChartProps) {
  return (
    <Suspense fallback={<div style={{ height: props.height }}><LoadingRegion label="Drawing the chart…" /></div>}>
      <EChart {...props} />
    </Suspense>
  );
}
