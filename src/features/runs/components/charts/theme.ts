// Chart colours from the Lotwise palette (tailwind.config.ts): ink surfaces, paper text, signal accent, pass/fault.
export const chartColors = {
  axis: "#53637b",
  grid: "#252f3e",
  text: "#b4bfcf",
  median: "#f0b46a",
  pass: "#37a676",
  fault: "#d9564a",
  series: ["#f0b46a", "#5cc394", "#8c9bb1", "#eb7a6f", "#f6d3a4", "#8fd6b4"],
} as const;

export const baseTextStyle = { color: chartColors.text, fontFamily: "JetBrains Mono, ui-monospace, monospace", fontSize: 11 };

/** Axis styling shared by every run chart. */
export function axisStyle(name: string) {
  return {
    name,
    nameTextStyle: baseTextStyle,
    axisLine: { lineStyle: { color: chartColors.axis } },
    axisLabel: { ...baseTextStyle },
    splitLine: { lineStyle: { color: chartColors.grid } },
  };
}
