/**
 * SI-prefixed numbers as engineers type them: "4.7n", "33 pF", "1.2 GHz", "1.2k", "2.2u", "1e-9",
 * RKM style ("4k7" = 4700, "2n2" = 2.2e-9, "4R7" = 4.7, "470R" = 470), with Ω/ohm suffixes.
 * Prefixes f p n u/µ m k M G T (m = milli, M = mega; K is read as kilo too).
 */

const PREFIX_EXP: Record<string, number> = {
  f: -15, p: -12, n: -9, u: -6, "µ": -6, "μ": -6, m: -3, k: 3, K: 3, M: 6, G: 9, T: 12,
};

const NUMBER = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+))(?:[eE]([+-]?\d+))?\s*(.*)$/;
const RKM = /^(\d+)([pnuµμmkKMGTR])(\d+)\s*(.*)$/;

/**
 * Parse an SI-prefixed number.
 *
 * Prefixes are case-sensitive (m = milli, M = mega, f = femto); unit words are not ("pf" = pF).
 * A single letter after the number is read as a prefix when it is one ("1f" = 1e-15, "1m" = 1e-3),
 * otherwise as a unit ("1F" = 1 farad, "1H").
 *
 * @param text - e.g. "4.7n", "33 pF", "1.2 GHz", "4k7", "470R", "10 Ω"
 * @returns the value in SI base units (the unit word itself is dropped)
 * @throws Error when the text is not a number with an optional prefix and unit
 * @example parseSi("33 pF") // → 3.3e-11
 */
export function parseSi(text: string): number {
  const t = typeof text === "string" ? text.trim() : "";
  const rkm = RKM.exec(t);
  if (rkm && isUnit(rkm[4])) {
    const exp = rkm[2] === "R" ? 0 : PREFIX_EXP[rkm[2]];
    return decimal(`${rkm[1]}.${rkm[3]}`, exp);
  }
  const m = NUMBER.exec(t);
  if (m) {
    const exp = m[2] === undefined ? 0 : Number(m[2]);
    const rest = m[3];
    const first = rest.charAt(0);
    if (first !== "" && first in PREFIX_EXP && isUnit(rest.slice(1).trim())) return decimal(m[1], exp + PREFIX_EXP[first]);
    if (isUnit(rest)) return decimal(m[1], exp);
  }
  throw new Error(`cannot read "${String(text)}" as a number with an optional SI prefix and unit (e.g. 4.7n, 33 pF, 1.2 GHz, 4k7)`);
}

/**
 * Format a value with an SI prefix chosen so the mantissa is in [1, 1000).
 *
 * @param value - value in SI base units
 * @param unit - unit symbol to append ("H", "F", "Hz", "Ω"); default none
 * @param digits - significant digits, default 4 (trailing zeros dropped)
 * @returns e.g. formatSi(4.7e-9, "H") → "4.7 nH"; formatSi(4.7e-9) → "4.7n"
 */
export function formatSi(value: number, unit = "", digits = 4): string {
  const sep = unit === "" ? "" : " ";
  if (!Number.isFinite(value)) return `${String(value)}${sep}${unit}`;
  if (value === 0) return `0${sep}${unit}`;
  let e3 = Math.floor(Math.log10(Math.abs(value)) / 3) * 3;
  e3 = Math.min(12, Math.max(-15, e3));
  let mant = Number(scale(value, -e3).toPrecision(digits));
  if (Math.abs(mant) >= 1000 && e3 < 12) {
    e3 += 3;
    mant = Number(scale(value, -e3).toPrecision(digits));
  }
  const prefix = e3 === 0 ? "" : PREFIX_OUT[e3];
  return `${String(mant)}${prefix === "" && unit === "" ? "" : sep}${prefix}${unit}`;
}

const PREFIX_OUT: Record<number, string> = { [-15]: "f", [-12]: "p", [-9]: "n", [-6]: "µ", [-3]: "m", 3: "k", 6: "M", 9: "G", 12: "T" };

/** Decimal digits × 10^exp, parsed in one step so "2n2" is exactly the double nearest 2.2e-9. */
function decimal(digits: string, exp: number): number {
  return Number(`${digits}e${exp}`);
}

function isUnit(u: string): boolean {
  return u === "" || /^(hz|ohms?|Ω|f|h|s|r)$/i.test(u);
}

/** x·10^exp with exact powers of ten (10^k is exact for |k| ≤ 22, so divide for negative k). */
function scale(x: number, exp: number): number {
  return exp >= 0 ? x * 10 ** exp : x / 10 ** -exp;
}
