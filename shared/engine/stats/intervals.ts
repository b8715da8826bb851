/**
 * Confidence intervals for a binomial proportion (yield = x passing units out of n).
 *
 * Wilson score interval (NIST/SEMATECH e-Handbook of Statistical Methods, sec. 7.2.4.1;
 * E. B. Wilson, JASA 22:209–212, 1927):
 *   bounds = [p + z²/(2n) ± z·√(p(1−p)/n + z²/(4n²))] / (1 + z²/n),   p = x/n, z = Φ⁻¹(1 − α/2).
 * Clopper–Pearson "exact" interval (NIST sec. 7.2.4.2; Clopper & Pearson, Biometrika 26:404–413, 1934):
 *   L = B⁻¹(α/2; x, n−x+1) (L = 0 when x = 0),  U = B⁻¹(1−α/2; x+1, n−x) (U = 1 when x = n),
 * with B⁻¹ the beta quantile from @stdlib/stats-base-dists-beta-quantile.
 */
import betaQuantile from "@stdlib/stats-base-dists-beta-quantile";
import { EngineError } from "../errors";
import { normalQuantile } from "./normal";

/** A two-sided interval [lower, upper] for a proportion. */
export type ProportionInterval = [number, number];

/**
 * Wilson score interval.
 * @param x successes (integer 0..n)
 * @param n trials (positive integer)
 * @param confidence two-sided confidence level in (0, 1), default 0.95
 * @returns [lower, upper], both in [0, 1]
 * @throws EngineError INVALID_INPUT for a bad x, n or confidence
 * @example wilsonInterval(950, 1000) // ≈ [0.934686, 0.961870]
 */
export function wilsonInterval(x: number, n: number, confidence = 0.95): ProportionInterval {
  validateProportionInput(x, n, confidence);
  const z = normalQuantile(1 - (1 - confidence) / 2);
  const p = x / n;
  const z2 = z * z;
  const center = p + z2 / (2 * n);
  const half = z * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n));
  const denom = 1 + z2 / n;
  return [Math.max(0, (center - half) / denom), Math.min(1, (center + half) / denom)];
}

/**
 * Half-width of the Wilson interval, (upper − lower)/2.
 * @param x successes, @param n trials, @param confidence default 0.95
 */
export function wilsonHalfWidth(x: number, n: number, confidence = 0.95): number {
  const [lo, hi] = wilsonInterval(x, n, confidence);
  return (hi - lo) / 2;
}

/**
 * Clopper–Pearson (exact) interval.
 * @param x successes (integer 0..n)
 * @param n trials (positive integer)
 * @param confidence two-sided confidence level in (0, 1), default 0.95
 * @returns [lower, upper]
 * @throws EngineError INVALID_INPUT for a bad x, n or confidence
 * @example clopperPearsonInterval(950, 1000) // ≈ [0.934610, 0.962665]
 */
export function clopperPearsonInterval(x: number, n: number, confidence = 0.95): ProportionInterval {
  validateProportionInput(x, n, confidence);
  const alpha = 1 - confidence;
  const lower = x === 0 ? 0 : betaQuantile(alpha / 2, x, n - x + 1);
  const upper = x === n ? 1 : betaQuantile(1 - alpha / 2, x + 1, n - x);
  return [lower, upper];
}

function validateProportionInput(x: number, n: number, confidence: number): void {
  if (!Number.isInteger(n) || n < 1) throw new EngineError("INVALID_INPUT", "`n` must be a positive integer", { path: "n" });
  if (!Number.isInteger(x) || x < 0 || x > n) throw new EngineError("INVALID_INPUT", "`x` must be an integer between 0 and n", { path: "x" });
  if (!(confidence > 0 && confidence < 1)) throw new EngineError("INVALID_INPUT", "`confidence` must be between 0 and 1", { path: "confidence" });
}
