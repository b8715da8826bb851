import { formatSi } from "@shared/units";
import { escapeHtml } from "@/lib/escape-html";
import { CHART_COLORS, type AxisSpec, type ChartMaskRect, type ResponseChartProps } from "@/components/charts/response-chart-types";

type Extent = { min: number; max: number };
type Pair = [number, number | null];

const PALETTE = [CHART_COLORS.signal, CHART_COLORS.sky, CHART_COLORS.pass, CHART_COLORS.paper, CHART_COLORS.fault];
const MASK_FILL = "rgba(235, 122, 111, 0.16)";
const MASK_EDGE = "rgba(235, 122, 111, 0.85)";

/** Pairs (x, y) with non-finite y as gaps (null), and non-positive x dropped (log axis). */
function pairs(x: ArrayLike<number>, y: ArrayLike<number>): Pair[] {
  const out: Pair[] = [];
  for (let k = 0; k < x.length; k++) {
    if (!(x[k] > 0)) continue;
    out.push([x[k], Number.isFinite(y[k]) ? y[k] : null]);
  }
  return out;
}

function grow(extent: Extent, values: ArrayLike<number>) {
  for (let k = 0; k < values.length; k++) {
    const v = values[k];
    if (Number.isFinite(v)) {
      extent.min = Math.min(extent.min, v);
      extent.max = Math.max(extent.max, v);
    }
  }
}

/** Axis bounds: the caller's, else the data's and the mask's, padded by 5 % and rounded outward. */
function axisExtent(props: ResponseChartProps, axis: 0 | 1, spec?: AxisSpec): Extent {
  const e: Extent = { min: Infinity, max: -Infinity };
  for (const s of props.series) if ((s.axis ?? 0) === axis) grow(e, s.y);
  for (const b of props.bands ?? []) if ((b.axis ?? 0) === axis) (grow(e, b.lower), grow(e, b.upper));
  for (const m of props.mask ?? []) if ((m.axis ?? 0) === axis) grow(e, [m.min ?? NaN, m.max ?? NaN]);
  if (!Number.isFinite(e.min)) Object.assign(e, { min: 0, max: 1 });
  const pad = Math.max((e.max - e.min) * 0.05, 0.5);
  const step = e.max - e.min > 20 ? 10 : 1;
  const floor = e.min >= 0 ? Math.max(0, e.min - pad) : e.min - pad; // a positive quantity (delay) keeps its axis ≥ 0
  const min = spec?.min ?? Math.floor(floor / step) * step;
  const max = spec?.max ?? Math.ceil((e.max + pad) / step) * step;
  return { min, max: max > min ? max : min + 1 };
}

function xExtent(props: ResponseChartProps): Extent {
  const e: Extent = { min: Infinity, max: -Infinity };
  for (const s of props.series) grow(e, Array.from(s.x).filter((v) => v > 0));
  for (const b of props.bands ?? []) grow(e, Array.from(b.x).filter((v) => v > 0));
  if (!Number.isFinite(e.min)) return { min: 1e6, max: 1e9 };
  return e;
}

/** Mask rectangles in data coordinates: below `min` down to the axis floor, above `max` up to its top. */
function maskAreas(mask: ChartMaskRect[], extent: Extent) {
  const areas: unknown[] = [];
  for (const m of mask) {
    const name = m.label ?? "limit";
    if (m.min !== undefined) areas.push([{ name, coord: [m.from, extent.min] }, { coord: [m.to, m.min] }]);
    if (m.max !== undefined) areas.push([{ name, coord: [m.from, m.max] }, { coord: [m.to, extent.max] }]);
  }
  return areas;
}

/** One hovered point as ECharts hands it to an axis tooltip's formatter (`marker` is ECharts' own HTML). */
export type TooltipItem = { seriesId: string; seriesName: string; marker: string; value: Pair };

/**
 * The tooltip of the response chart: frequency, then each curve's name and value. ECharts inserts the result as
 * HTML, so every name is escaped (names come from people: measured responses are named after their files).
 */
export function formatResponseTooltip(items: TooltipItem[]): string {
  const lines = items.filter((p) => p.seriesId.startsWith("line-") && p.value[1] !== null);
  if (!lines.length) return "";
  const head = escapeHtml(formatSi(lines[0].value[0], "Hz", 4));
  return [head, ...lines.map((p) => `${p.marker} ${escapeHtml(p.seriesName)}: ${(p.value[1] as number).toFixed(2)}`)].join("<br/>");
}

/** The ECharts option for a {@link ResponseChartProps}. */
export function buildChartOption(props: ResponseChartProps) {
  const usesRight = [...props.series, ...(props.bands ?? []), ...(props.mask ?? [])].some((s) => s.axis === 1);
  const left = axisExtent(props, 0, props.yAxis);
  const right = usesRight ? axisExtent(props, 1, props.y2Axis) : null;
  const x = xExtent(props);
  const axisStyle = {
    axisLine: { onZero: false, lineStyle: { color: CHART_COLORS.axis } },
    axisLabel: { color: CHART_COLORS.ink, fontFamily: "JetBrains Mono, monospace", fontSize: 11 },
    nameTextStyle: { color: CHART_COLORS.ink, fontSize: 11 },
    splitLine: { lineStyle: { color: CHART_COLORS.grid } },
  };
  const series: unknown[] = [];
  (props.bands ?? []).forEach((b, k) => {
    const stack = `band-${k}`;
    const upper = Array.from(b.upper, (u, i) => u - b.lower[i]);
    const common = { type: "line", stack, stackStrategy: "all", yAxisIndex: b.axis ?? 0, showSymbol: false, silent: true };
    series.push({ ...common, id: `band-${k}-lo`, name: b.name, data: pairs(b.x, b.lower), lineStyle: { opacity: 0 } });
    series.push({
      ...common, id: `band-${k}-hi`, name: b.name, data: pairs(b.x, upper), lineStyle: { opacity: 0 },
      areaStyle: { color: b.color ?? CHART_COLORS.signal, opacity: b.opacity ?? 0.25 },
    });
  });
  props.series.forEach((s, k) => {
    const color = s.style?.color ?? PALETTE[k % PALETTE.length];
    series.push({
      type: "line", id: `line-${k}`, name: s.name, yAxisIndex: s.axis ?? 0, showSymbol: false, connectNulls: false,
      data: pairs(s.x, s.y), color, lineStyle: { color, width: s.style?.width ?? 1.8, type: s.style?.dash ?? "solid" },
    });
  });
  for (const axis of [0, 1] as const) {
    const rects = (props.mask ?? []).filter((m) => (m.axis ?? 0) === axis);
    const extent = axis === 0 ? left : right;
    if (!rects.length || !extent) continue;
    series.push({
      type: "line", id: `mask-${axis}`, name: "Limit mask", yAxisIndex: axis, data: [], color: MASK_EDGE,
      markArea: { silent: true, itemStyle: { color: MASK_FILL, borderColor: MASK_EDGE, borderWidth: 1 }, label: { show: false }, data: maskAreas(rects, extent) },
    });
  }
  const yAxes = [
    { type: "value", name: props.yAxis?.label ?? "dB", min: left.min, max: left.max, ...axisStyle },
    ...(right ? [{ type: "value", name: props.y2Axis?.label ?? "ns", min: right.min, max: right.max, ...axisStyle, splitLine: { show: false } }] : []),
  ];
  return {
    animation: false,
    grid: { left: 56, right: right ? 56 : 20, top: 36, bottom: 50 },
    legend: { top: 4, textStyle: { color: CHART_COLORS.paper, fontSize: 11 }, data: props.series.map((s) => s.name) },
    tooltip: {
      trigger: "axis",
      backgroundColor: "#1a222e",
      borderColor: CHART_COLORS.grid,
      textStyle: { color: CHART_COLORS.paper, fontSize: 11 },
      formatter: formatResponseTooltip,
    },
    xAxis: {
      type: "log", logBase: 10, min: x.min, max: x.max, name: "Frequency (Hz)", nameGap: 26, nameLocation: "middle", ...axisStyle,
      axisLabel: { ...axisStyle.axisLabel, formatter: (v: number) => formatSi(v, "", 3) },
    },
    yAxis: yAxes,
    series,
  };
}
