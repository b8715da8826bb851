import type { PartKind } from "@shared/engine/netlist";
import { formatSi } from "@shared/units";
import { readTolerance, type ToleranceValue } from "@shared/tolerance";

export type { ToleranceValue };

/**
 * A tolerance cell of the parts table, read by the one shared reader (shared/tolerance.ts: "2%", "0.02", a letter
 * code, "0.25p"), so the table, the grade form, the parts CSV and the command line agree.
 * @returns the tolerance, or an error message for the cell
 */
export function parseToleranceText(text: string, kind: PartKind): { ok: true; value: ToleranceValue } | { ok: false; error: string } {
  const r = readTolerance(text, kind);
  return r.ok ? { ok: true, value: r.value } : { ok: false, error: `${r.error.charAt(0).toUpperCase()}${r.error.slice(1)}.` };
}

/** The cell text for a part's tolerance: "2%" or an absolute value with its unit ("250 fF"). */
export function formatToleranceText(value: ToleranceValue, unit: string): string {
  if (value.toleranceAbs !== undefined) return formatSi(value.toleranceAbs, unit);
  if (value.tolerance !== undefined) return `${Number((value.tolerance * 100).toPrecision(12))}%`;
  return "";
}
