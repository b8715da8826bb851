import ReactEChartsCore from "echarts-for-react/esm/core";
import * as echarts from "echarts/core";
import { LineChart } from "echarts/charts";
import { GridComponent, LegendComponent, MarkAreaComponent, TooltipComponent } from "echarts/components";
import { CanvasRenderer } from "echarts/renderers";
import { useMemo } from "react";
import { buildChartOption } from "@/components/charts/response-chart-option";
import type { ResponseChartProps } from "@/components/charts/response-chart-types";

echarts.use([LineChart, GridComponent, LegendComponent, MarkAreaComponent, TooltipComponent, CanvasRenderer]);

/** The ECharts half of {@link ResponseChart}; a separate module so it is its own lazy chunk. */
export default function ResponseChartCanvas(props: ResponseChartProps) {
  const option = useMemo(() => buildChartOption(props), [props]);
  return (
    <ReactEChartsCore
      echarts={echarts}
      option={option}
      notMerge
      lazyUpdate
      style={{ height: props.height ?? 320, width: "100%" }}
      opts={{ renderer: "canvas" }}
    />
  );
}
