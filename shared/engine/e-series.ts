/**
 * IEC 60063:2015 preferred-number series (E series) and snapping to them.
 *
 * E3…E24 carry their historical values, which differ from round(10^(i/N), 1 decimal) at
 * 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2 (IEC 60063; docs/references.md §5). E48, E96 and E192 are
 * round(10^(i/N), 2 decimals), half-up, with the single listed exception E192 i = 185 → 9.20
 * (the formula gives 9.19).
 */
import { EngineError } from "./errors";
import type { ESeriesName } from "./netlist";

const HISTORICAL: Record<"E3" | "E6" | "E12" | "E24", readonly number[]> = {
  E3: [1.0, 2.2, 4.7],
  E6: [1.0, 1.5, 2.2, 3.3, 4.7, 6.8],
  E12: [1.0, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2],
  E24: [1.0, 1.1, 1.2, 1.3, 1.5, 1.6, 1.8, 2.0, 2.2, 2.4, 2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 5.1, 5.6, 6.2, 6.8, 7.5, 8.2, 9.1],
};

const COUNTS: Record<ESeriesName, number> = { E3: 3, E6: 6, E12: 12, E24: 24, E48: 48, E96: 96, E192: 192 };

/** Mantissas in hundredths (integers), cached per series. */
const hundredthsCache = new Map<ESeriesName, Int32Array>();
const valuesCache = new Map<ESeriesName, readonly number[]>();

/**
 * Mantissas of an E series in [1, 10), ascending.
 *
 * @param name - "E3" … "E192"
 * @returns frozen list, e.g. E12 → [1, 1.2, 1.5, 1.8, 2.2, 2.7, 3.3, 3.9, 4.7, 5.6, 6.8, 8.2]
 * @throws EngineError INVALID_INPUT for an unknown series name
 */
export function eSeriesValues(name: ESeriesName): readonly number[] {
  const cached = valuesCache.get(name);
  if (cached) return cached;
  const values = Object.freeze(Array.from(seriesHundredths(name), (k) => k / 100));
  valuesCache.set(name, values);
  return values;
}

/**
 * Snap a value to the nearest member of an E series in log scale (across decades: 9.6 → 10 in E24).
 *
 * nearest = argmin over members m·10^d of |ln(m·10^d / value)|
 *
 * @param value - positive finite value in any unit
 * @param name - series name
 * @returns `value` (the snapped value) and `error` = (snapped − value)/value
 * @throws EngineError INVALID_INPUT when value is not finite and > 0, or the series is unknown
 * @example snapToSeries(0.000483, "E12") // → { value: 0.00047, error: -0.0269… }
 */
export function snapToSeries(value: number, name: ESeriesName): { value: number; error: number } {
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new EngineError("INVALID_INPUT", `\`value\` must be a finite number > 0 to snap to ${String(name)} (got ${String(value)})`, {
      path: "value",
    });
  }
  const hundredths = seriesHundredths(name);
  const decade = Math.floor(Math.log10(value));
  const logV = Math.log(value);
  let bestK = 0;
  let bestDecade = 0;
  let bestDist = Infinity;
  // Neighbouring decades too: log10 may round a value just below a power of ten up to it, and
  // the nearest member of a value like 9.6 is 1.0 in the next decade.
  for (let d = decade - 1; d <= decade + 1; d++) {
    for (let i = 0; i < hundredths.length; i++) {
      const dist = Math.abs(Math.log(toValue(hundredths[i], d)) - logV);
      if (dist < bestDist) {
        bestDist = dist;
        bestK = hundredths[i];
        bestDecade = d;
      }
    }
  }
  const snapped = toValue(bestK, bestDecade);
  return { value: snapped, error: (snapped - value) / value };
}

/** k hundredths × 10^decade, formed so that exact decimals such as 0.00047 come out correctly rounded. */
function toValue(k: number, decade: number): number {
  const e = decade - 2;
  return e >= 0 ? k * 10 ** e : k / 10 ** -e;
}

function seriesHundredths(name: ESeriesName): Int32Array {
  const cached = hundredthsCache.get(name);
  if (cached) return cached;
  const n = COUNTS[name];
  if (n === undefined) throw new EngineError("INVALID_INPUT", `unknown E series "${String(name)}" (use E3, E6, E12, E24, E48, E96 or E192)`, { path: "series" });
  let out: Int32Array;
  if (name === "E3" || name === "E6" || name === "E12" || name === "E24") {
    out = Int32Array.from(HISTORICAL[name], (v) => Math.round(v * 100));
  } else {
    out = new Int32Array(n);
    for (let i = 0; i < n; i++) out[i] = Math.round(100 * 10 ** (i / n));
    if (name === "E192") out[185] = 920; // IEC 60063 lists 9.20 where the formula gives 9.19
  }
  hundredthsCache.set(name, out);
  return out;
}
