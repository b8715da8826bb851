import { formatSi } from "@shared/units";

/** "97.3 %" from a fraction; digits after the point default to 1. */
export function percent(fraction: number | null | undefined, digits = 1): string {
  if (fraction === null || fraction === undefined || !Number.isFinite(fraction)) return "—";
  return `${(fraction * 100).toFixed(digits)} %`;
}

/** "96.1 – 98.2 %" for a two-sided interval of fractions. */
export function interval(bounds: readonly [number, number] | null | undefined, digits = 1): string {
  if (!bounds) return "—";
  return `${(bounds[0] * 100).toFixed(digits)} – ${(bounds[1] * 100).toFixed(digits)} %`;
}

/** A frequency with an SI prefix, e.g. "156.8 MHz". */
export function hz(value: number): string {
  return formatSi(value, "Hz", 4);
}

/** Money in the catalogue's unit (no currency is stored): "1,234.50". */
export function money(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return value.toLocaleString(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 });
}

/** A whole count with grouping, "12,000". */
export function count(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return Math.round(value).toLocaleString();
}

/** A number with fixed decimals or "—". */
export function fixed(value: number | null | undefined, digits = 2): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "—" : value.toFixed(digits);
}

/** "1 min 05 s", "12 s", "2 h 03 min" for a duration in seconds. */
export function duration(seconds: number | null | undefined): string {
  if (seconds === null || seconds === undefined || !Number.isFinite(seconds)) return "—";
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${String(s % 60).padStart(2, "0")} s`;
  return `${Math.floor(s / 3600)} h ${String(Math.floor((s % 3600) / 60)).padStart(2, "0")} min`;
}

/** A rule's display name: its label, else "s21_db 1 MHz–80 MHz". */
export function ruleName(rule: { label?: string; metric: string; from: number; to: number }): string {
  return rule.label || `${rule.metric} ${hz(rule.from)}–${hz(rule.to)}`;
}
