/**
 * The one reader of a part's tolerance as people write it: the parts table, the grade form, the parts CSV and the
 * command line all call `readTolerance`, so the same text means the same tolerance everywhere.
 *
 * - `2%`, `±0.5 %`, `+/-1%`: a percentage (read as a decimal, so "2.2%" is exactly the double nearest 0.022);
 * - `0.02`, `2e-2`: a bare number is a fraction of the value (at most 0.5; a bare "5" is refused with the hint
 *   to write "5%");
 * - an IEC 60062:2016 letter: F G J K M = ±1 2 5 10 20 %; B C D = ±0.1 0.25 0.5 pF on a capacitor, ±0.1 0.25 0.5 %
 *   on a resistor, refused on an inductor (ambiguous); Z (+80/−20 %) is asymmetric and refused;
 * - an absolute value with an SI prefix or unit: `0.25p`, `0.1 pF`, `±50 nH` (the kind's own unit).
 */
import type { PartKind } from "./engine/netlist";
import { formatSi, parseSi } from "./units";

/** A part's tolerance: relative (fraction of the value) or absolute (SI base units). */
export type ToleranceValue = { tolerance?: number; toleranceAbs?: number };

export type ToleranceReading = { ok: true; value: ToleranceValue; warning?: string } | { ok: false; error: string };

/** Largest relative tolerance (±50 %). */
export const MAX_TOLERANCE = 0.5;

/** IEC 60062:2016 letter codes: relative (all kinds) and small (pF on capacitors, % on resistors). */
export const LETTER_RELATIVE: Readonly<Record<string, number>> = { F: 0.01, G: 0.02, J: 0.05, K: 0.1, M: 0.2 };
export const LETTER_SMALL: Readonly<Record<string, number>> = { B: 0.1, C: 0.25, D: 0.5 };

const PLAIN_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const SIGNED = /^(?:±|\+\/-|\+-)\s*/;
const UNIT: Record<PartKind, string> = { R: "Ω", L: "H", C: "F" };

/**
 * Reads one tolerance text for a part of `kind` (and nominal `value`, for the hint on letters B/C/D).
 * @returns the tolerance (empty text: neither kind), or the reason it cannot be read
 * @example readTolerance("2.2%", "L") // → { ok: true, value: { tolerance: 0.022 } }
 */
export function readTolerance(text: string, kind: PartKind, value?: number): ToleranceReading {
  const raw = typeof text === "string" ? text.trim() : "";
  if (raw === "") return { ok: true, value: {} };
  const letter = raw.toUpperCase();
  if (letter in LETTER_RELATIVE) return { ok: true, value: { tolerance: LETTER_RELATIVE[letter] } };
  if (letter in LETTER_SMALL) {
    const n = LETTER_SMALL[letter];
    if (kind === "L") return { ok: false, error: `letter code ${letter} is ambiguous on an inductor; write the tolerance as a percentage or an absolute value` };
    if (kind === "R") return { ok: true, value: { tolerance: Number(`${n}e-2`) } };
    const warning = value !== undefined && value > 10e-12
      ? `letter code ${letter} read as ±${n} pF (IEC 60062); on a ${formatSi(value, "F")} capacitor it may have meant ±${n} %`
      : undefined;
    return { ok: true, value: { toleranceAbs: Number(`${n}e-12`) }, ...(warning ? { warning } : {}) };
  }
  if (letter === "Z") return { ok: false, error: "letter code Z (+80/−20 %) is asymmetric and not supported" };
  const unsigned = raw.replace(SIGNED, "");
  const pct = /^(.*?)\s*%$/.exec(unsigned);
  const numText = pct ? pct[1] : unsigned;
  if (PLAIN_NUMBER.test(numText)) {
    const t = Number(numText);
    // "2.2e-2" is the double nearest 0.022, where 2.2 / 100 is not
    const fraction = !pct ? t : /[eE]/.test(numText) ? t / 100 : Number(`${numText}e-2`);
    if (!Number.isFinite(fraction)) return { ok: false, error: `not a tolerance ("${raw}")` };
    if (fraction < 0) return { ok: false, error: `must be ≥ 0 (got "${raw}")` };
    if (fraction > MAX_TOLERANCE) {
      const hint = !pct && t >= 1 ? `; for ${t} % write "${t}%"` : "";
      return { ok: false, error: `±${Number((fraction * 100).toPrecision(6))} % is above the ±${MAX_TOLERANCE * 100} % limit ("${raw}"${hint})` };
    }
    return { ok: true, value: { tolerance: fraction } };
  }
  if (!pct) {
    try {
      const abs = parseSi(unsigned);
      if (abs < 0) return { ok: false, error: `must be ≥ 0 (got "${raw}")` };
      if (Number.isFinite(abs)) return { ok: true, value: { toleranceAbs: abs } };
    } catch {
      // not an SI value either: fall through to the message
    }
  }
  return { ok: false, error: `not a tolerance ("${raw}"; write 2%, 0.02, a letter code F G J K M, B C D or an absolute value such as 0.25p)` };
}

/** The text that reads back to the same tolerance: "2%" (shortest exact decimal) or an absolute value with its unit ("250 fF"). */
export function formatTolerance(value: ToleranceValue, kind: PartKind): string {
  if (value.toleranceAbs !== undefined) return formatSi(value.toleranceAbs, UNIT[kind], 12);
  if (value.tolerance !== undefined) return `${Number((value.tolerance * 100).toPrecision(12))}%`;
  return "";
}
