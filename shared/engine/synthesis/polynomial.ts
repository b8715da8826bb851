/**
 * Real polynomials and their complex roots, for the Darlington synthesis of the Bessel prototype.
 * Coefficients are stored in ascending order: `c[k]` multiplies x^k.
 */
import { EngineError } from "../errors";

/** A complex number for scalar (non-hot-loop) code. */
export interface Complex {
  re: number;
  im: number;
}

/** Options of {@link findPolynomialRoots}. */
export interface RootOptions {
  /** Relative correction below which a root counts as converged (default 1e-14). */
  tolerance?: number;
  /** Iteration cap of the simultaneous iteration (default 500). */
  maxIterations?: number;
}

/**
 * All complex roots of a real polynomial by the Aberth–Ehrlich simultaneous iteration
 * (O. Aberth, Math. Comp. 27 (1973) 339–344; L. W. Ehrlich, Comm. ACM 10 (1967) 107–108):
 * z_i ← z_i − w_i, w_i = (p/p′)(z_i) / (1 − (p/p′)(z_i) · Σ_{j≠i} 1/(z_i − z_j)).
 * Start: points on a circle of radius |c0/cn|^(1/n) (geometric mean of the root moduli), angles offset
 * to break symmetry. A root stops moving when its correction is below `tolerance`·|z| or |p(z)| is
 * below the rounding level of Horner's rule at z.
 *
 * @param coeffs ascending real coefficients; leading (highest) coefficient must be non-zero and c0 ≠ 0
 *   (remove zero roots first)
 * @returns the n roots, in no particular order
 * @throws EngineError INVALID_INPUT for a zero leading or constant coefficient or non-finite coefficients;
 *   NO_CONVERGENCE when an iterate is non-finite or `maxIterations` is reached
 * @example findPolynomialRoots([-2, 0, 1]) // returns ≈ [{re: 1.41421, im: 0}, {re: -1.41421, im: 0}] (some order)
 */
export function findPolynomialRoots(coeffs: readonly number[], options: RootOptions = {}): Complex[] {
  const tolerance = options.tolerance ?? 1e-14;
  const maxIterations = options.maxIterations ?? 500;
  const n = coeffs.length - 1;
  if (n < 1) return [];
  if (!coeffs.every(Number.isFinite)) throw new EngineError("INVALID_INPUT", "polynomial coefficients must be finite");
  if (coeffs[n] === 0 || coeffs[0] === 0) {
    throw new EngineError("INVALID_INPUT", "polynomial must have non-zero leading and constant coefficients");
  }
  const c = coeffs.map((v) => v / coeffs[n]);
  const radius = Math.pow(Math.abs(c[0]), 1 / n);
  const z: Complex[] = [];
  for (let k = 0; k < n; k++) {
    const angle = (2 * Math.PI * k) / n + Math.PI / (2 * n);
    z.push({ re: radius * Math.cos(angle), im: radius * Math.sin(angle) });
  }
  const done = new Array<boolean>(n).fill(false);
  for (let iter = 0; iter < maxIterations; iter++) {
    let active = 0;
    for (let i = 0; i < n; i++) {
      if (done[i]) continue;
      const { p, dp, bound } = hornerWithDerivative(c, z[i]);
      if (cabs(p) <= bound) {
        done[i] = true;
        continue;
      }
      const ratio = cdiv(p, dp);
      let sum: Complex = { re: 0, im: 0 };
      for (let j = 0; j < n; j++) {
        if (j !== i) sum = cadd(sum, cdiv({ re: 1, im: 0 }, csub(z[i], z[j])));
      }
      const w = cdiv(ratio, csub({ re: 1, im: 0 }, cmul(ratio, sum)));
      if (!Number.isFinite(w.re) || !Number.isFinite(w.im)) {
        throw new EngineError("NO_CONVERGENCE", `root iteration produced a non-finite step at iteration ${iter}`);
      }
      z[i] = csub(z[i], w);
      if (cabs(w) <= tolerance * cabs(z[i])) done[i] = true;
      else active++;
    }
    if (active === 0) return z;
  }
  throw new EngineError("NO_CONVERGENCE", `polynomial root finding did not converge in ${maxIterations} iterations`, {
    details: { degree: n, maxIterations },
  });
}

/** Value of a real polynomial at a complex point. */
export function evaluatePolynomial(coeffs: readonly number[], x: Complex): Complex {
  let acc: Complex = { re: 0, im: 0 };
  for (let k = coeffs.length - 1; k >= 0; k--) acc = cadd(cmul(acc, x), { re: coeffs[k], im: 0 });
  return acc;
}

/** p(z), p′(z) and the rounding bound 4ε·Σ|c_k||z|^k of Horner's rule. */
function hornerWithDerivative(c: readonly number[], z: Complex): { p: Complex; dp: Complex; bound: number } {
  let p: Complex = { re: 0, im: 0 };
  let dp: Complex = { re: 0, im: 0 };
  let bound = 0;
  const r = cabs(z);
  for (let k = c.length - 1; k >= 0; k--) {
    dp = cadd(cmul(dp, z), p);
    p = cadd(cmul(p, z), { re: c[k], im: 0 });
    bound = bound * r + Math.abs(c[k]);
  }
  return { p, dp, bound: 4 * Number.EPSILON * bound };
}

export function cadd(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}
export function csub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}
export function cmul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}
export function cdiv(a: Complex, b: Complex): Complex {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
export function cabs(a: Complex): number {
  return Math.hypot(a.re, a.im);
}
/** Principal square root (Re ≥ 0). */
export function csqrt(a: Complex): Complex {
  const r = cabs(a);
  const re = Math.sqrt((r + a.re) / 2);
  const im = Math.sqrt(Math.max(0, (r - a.re) / 2));
  return { re, im: a.im < 0 ? -im : im };
}
