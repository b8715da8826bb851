import { lazy, Suspense } from "react";
import { formatSi } from "@shared/units";
import { LoadingRegion } from "@/components/ui/spinner";
import type { ChartMaskRect, ResponseChartProps } from "@/components/charts/response-chart-types";

export type { ChartBand, ChartMaskRect, ChartSeries, ResponseChartProps } from "@/components/charts/response-chart-types";
export { CHART_COLORS } from "@/components/charts/response-chart-types";

const ResponseChartCanvas = lazy(() => import("@/components/charts/response-chart-canvas"));

/**
 * A frequency-response chart (log-frequency x axis) drawn with ECharts, loaded on first use so the
 * chart library stays out of the entry bundle. Below the canvas, a visually hidden list names the
 * curves and the limit mask for screen readers and tests.
 */
export function ResponseChart(props: ResponseChartProps) {
  const height = props.height ?? 320;
  return (
    <figure className="flex flex-col gap-1">
      <div style={{ height }} role="img" aria-label={props.title}>
        <Suspense fallback={<LoadingRegion label="Loading the chart…" />}>
          <ResponseChartCanvas {...props} height={height} />
        </Suspense>
      </div>
      <figcaption className="sr-only">
        {props.title}: {props.series.map((s) => s.name).join(", ")}
      </figcaption>
      {props.mask && props.mask.length > 0 && (
        <ul aria-label="Limit mask" className="sr-only">
          {props.mask.map((rect, k) => (
            <li key={k}>{describeRect(rect)}</li>
          ))}
        </ul>
      )}
    </figure>
  );
}

/** "harmonics: 300 MHz to 1 GHz, max -40" */
function describeRect({ from, to, min, max, label }: ChartMaskRect) {
  const bounds = [min !== undefined ? `min ${min}` : null, max !== undefined ? `max ${max}` : null].filter(Boolean).join(", ");
  return `${label ? `${label}: ` : ""}${formatSi(from, "Hz")} to ${formatSi(to, "Hz")}, ${bounds}`;
}
