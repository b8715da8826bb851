/**
 * Standard normal distribution helpers used by sampling and by the interval formulas.
 *
 * - `normalCdf(z)` Φ(z): erf by its all-positive series
 *   erf(x) = 2/√π · e^(−x²) · Σ_{n≥0} 2^n x^(2n+1) / (1·3·5···(2n+1))   (Abramowitz & Stegun 7.1.6)
 *   for |x| < 3, and erfc by its continued fraction (A&S 7.1.14) beyond; relative accuracy ≈ 1e-15.
 * - `normalQuantileFast(p)` Φ⁻¹(p) by Acklam's rational approximation (relative error < 1.2e-9),
 *   cheap enough for the sampling inner loop.
 * - `normalQuantile(p)` the same refined by two Halley steps on `normalCdf` (≈ 1e-15), for z values
 *   that enter reported numbers (e.g. z(0.975) of the Wilson interval).
 */

const SQRT2 = Math.SQRT2;
const TWO_OVER_SQRT_PI = 2 / Math.sqrt(Math.PI);
const SQRT_2PI = Math.sqrt(2 * Math.PI);

/** Standard normal density φ(z) = e^(−z²/2)/√(2π). */
export function normalPdf(z: number): number {
  return Math.exp(-0.5 * z * z) / SQRT_2PI;
}

/** Standard normal CDF Φ(z) = ½·erfc(−z/√2); NaN in, NaN out. */
export function normalCdf(z: number): number {
  if (Number.isNaN(z)) return NaN;
  const x = z / SQRT2;
  if (Math.abs(x) < 3) {
    const e = erfSeries(Math.abs(x));
    return x >= 0 ? 0.5 * (1 + e) : 0.5 * (1 - e);
  }
  const c = erfcContinuedFraction(Math.abs(x));
  return x > 0 ? 1 - 0.5 * c : 0.5 * c;
}

/** Φ⁻¹(p) by Acklam's algorithm; p outside (0, 1) gives ±Infinity at the ends and NaN beyond. */
export function normalQuantileFast(p: number): number {
  if (!(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return -Infinity;
  if (p === 1) return Infinity;
  if (p < P_LOW) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  }
  if (p > 1 - P_LOW) {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    return -(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) / ((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return ((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) /
    (((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1);
}

/** Φ⁻¹(p) to ≈ 1e-15: Acklam's value refined by two Halley steps on `normalCdf`. */
export function normalQuantile(p: number): number {
  let z = normalQuantileFast(p);
  if (!Number.isFinite(z)) return z;
  for (let k = 0; k < 2; k++) {
    const e = normalCdf(z) - p;
    const u = e / normalPdf(z);
    z = z - u / (1 + (z * u) / 2);
  }
  return z;
}

// Acklam's coefficients (P. J. Acklam, "An algorithm for computing the inverse normal cumulative
// distribution function", 2003; checked against jStat.normal.inv in tests/unit/engine/sampling.test.ts).
const A = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
const B = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
const C = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

function erfSeries(x: number): number {
  // Terms are all positive: no cancellation. Converges once 2x²/(2n+1) < 1.
  const x2 = x * x;
  let term = x;
  let sum = x;
  for (let n = 1; n < 200; n++) {
    term *= (2 * x2) / (2 * n + 1);
    sum += term;
    if (term < sum * 1e-17) break;
  }
  return TWO_OVER_SQRT_PI * Math.exp(-x2) * sum;
}

function erfcContinuedFraction(x: number): number {
  // erfc(x) = e^(−x²)/√π · 1/(x + (1/2)/(x + 1/(x + (3/2)/(x + 2/(x + ...))))), evaluated bottom-up.
  let f = x;
  for (let k = 60; k >= 1; k--) f = x + k / 2 / f;
  return Math.exp(-x * x) / Math.sqrt(Math.PI) / f;
}
