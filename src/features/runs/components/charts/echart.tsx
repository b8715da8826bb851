import ReactEChartsCore from "echarts-for-react/esm/core";
import * as echarts from "echarts/core";
import { BarChart, LineChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, MarkLineComponent, TooltipComponent } from "echarts/components";
import { CanvasRenderer } from "echarts/renderers";
import type { EChartsCoreOption } from "echarts/core";

// Tree-shaken ECharts: only the pieces the run screens draw (line, bar, grid, legend, tooltip, mask areas).
echarts.use([LineChart, BarChart, GridComponent, LegendComponent, TooltipComponent, MarkAreaComponent, MarkLineComponent, CanvasRenderer]);

export type EChartProps = { option: EChartsCoreOption; height: number; label: string };

/** The chart itself; load it through LazyChart so ECharts stays out of the entry chunk. */
export default function EChart({ option, height, label }: EChartProps) {
  return (
    <div role="img" aria-label={label} className="w-full">
      <ReactEChartsCore echarts={echarts} option={option} notMerge lazyUpdate style={{ height, width: "100%" }} opts={{ renderer: "canvas" }} />
    </div>
  );
}
