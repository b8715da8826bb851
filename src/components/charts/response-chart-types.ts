/**
 * Props of the shared response chart: curves over a log-frequency axis (Hz), optional percentile
 * bands and a limit mask drawn as shaded rectangles over the forbidden regions.
 */

/** Line look: colour (CSS), width (px) and dash. */
export type LineStyle = { color?: string; width?: number; dash?: "solid" | "dashed" | "dotted" };

/** One curve; `x` in Hz, `y` in the axis unit (dB or ns). Non-finite y values leave a gap. */
export type ChartSeries = {
  name: string;
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  style?: LineStyle;
  /** 0 = left axis (default), 1 = right axis. */
  axis?: 0 | 1;
};

/** A shaded band between `lower` and `upper` (e.g. the 5–95 % envelope), same x for both. */
export type ChartBand = {
  name: string;
  x: ArrayLike<number>;
  lower: ArrayLike<number>;
  upper: ArrayLike<number>;
  color?: string;
  /** Fill opacity, default 0.25. */
  opacity?: number;
  axis?: 0 | 1;
};

/**
 * One limit rule as a mask: over [from, to] Hz the region below `min` and the region above `max`
 * are forbidden and shaded. `label` names it in the tooltip and in the accessible list.
 */
export type ChartMaskRect = { from: number; to: number; min?: number; max?: number; label?: string; axis?: 0 | 1 };

export type AxisSpec = { label: string; min?: number; max?: number };

export type ResponseChartProps = {
  /** The chart's accessible name (the canvas itself is an image to assistive technology). */
  title: string;
  series: ChartSeries[];
  bands?: ChartBand[];
  mask?: ChartMaskRect[];
  /** Left axis, e.g. { label: "dB" }; right axis only when a series or mask uses axis 1. */
  yAxis?: AxisSpec;
  y2Axis?: AxisSpec;
  /** Height in px, default 320. */
  height?: number;
};

/** Lotwise's chart palette (from tailwind.config.ts). */
export const CHART_COLORS = {
  signal: "#e8973f",
  pass: "#5cc394",
  fault: "#eb7a6f",
  paper: "#e8dec9",
  ink: "#8c9bb1",
  sky: "#7fb3e6",
  grid: "#323e50",
  axis: "#6b7c95",
} as const;
