import type { PartKind } from "@shared/engine/netlist";
import { formatSi, parseSi } from "@shared/units";

/** A part's tolerance as typed in the parts table. */
export type ToleranceValue = { tolerance?: number; toleranceAbs?: number };

/** IEC 60062:2016 letter codes: relative (all kinds) and small (pF on capacitors, % on resistors). */
const LETTER_RELATIVE: Record<string, number> = { F: 0.01, G: 0.02, J: 0.05, K: 0.1, M: 0.2 };
const LETTER_SMALL: Record<string, number> = { B: 0.1, C: 0.25, D: 0.5 };
const PERCENT = /^±?\s*(\d+(?:\.\d*)?|\.\d+)\s*%$/;
const MAX_TOLERANCE = 0.5;

/**
 * Reads "2%", "±0.5 %", an IEC 60062 letter (F G J K M; B C D), or an absolute value with a prefix
 * ("0.25p", "0.1 pF"). B/C/D are ±0.1/0.25/0.5 pF on a capacitor and ±0.1/0.25/0.5 % on a resistor;
 * on an inductor they are ambiguous and refused.
 * @returns the tolerance, or an error message for the cell
 */
export function parseToleranceText(text: string, kind: PartKind): { ok: true; value: ToleranceValue } | { ok: false; error: string } {
  const t = text.trim();
  if (t === "") return { ok: true, value: {} };
  const letter = t.toUpperCase();
  if (letter in LETTER_RELATIVE) return { ok: true, value: { tolerance: LETTER_RELATIVE[letter] } };
  if (letter in LETTER_SMALL) {
    if (kind === "C") return { ok: true, value: { toleranceAbs: LETTER_SMALL[letter] * 1e-12 } };
    if (kind === "R") return { ok: true, value: { tolerance: LETTER_SMALL[letter] / 100 } };
    return { ok: false, error: `Letter ${letter} is ambiguous on an inductor; write a percentage such as 2%.` };
  }
  const pct = PERCENT.exec(t);
  if (pct) {
    const fraction = Number(pct[1]) / 100;
    if (fraction > MAX_TOLERANCE) return { ok: false, error: "Tolerance must be at most 50 %." };
    return { ok: true, value: { tolerance: fraction } };
  }
  if (/^±?\s*[\d.]+(?:e[+-]?\d+)?$/i.test(t)) {
    return { ok: false, error: "Add a % sign (2%), use a letter code (J) or an absolute value (0.25p)." };
  }
  try {
    const abs = parseSi(t.replace(/^±\s*/, ""));
    if (!(abs >= 0)) return { ok: false, error: "An absolute tolerance must be ≥ 0." };
    return { ok: true, value: { toleranceAbs: abs } };
  } catch {
    return { ok: false, error: "Write the tolerance as 2%, a letter code (F G J K M, B C D) or an absolute value (0.25p)." };
  }
}

/** The cell text for a part's tolerance: "2%" or an absolute value with its unit ("250 fF"). */
export function formatToleranceText(value: ToleranceValue, unit: string): string {
  if (value.toleranceAbs !== undefined) return formatSi(value.toleranceAbs, unit);
  if (value.tolerance !== undefined) return `${Number((value.tolerance * 100).toPrecision(6))}%`;
  return "";
}
