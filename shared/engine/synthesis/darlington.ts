/**
 * Darlington synthesis of a doubly terminated lossless all-pole ladder from its transmission function,
 * and the bracketed root finder used to locate its −3 dB point.
 */
import { EngineError } from "../errors";
import {
  cddAdd,
  cddDiv,
  cddMul,
  cddSub,
  dd,
  ddAdd,
  ddDiv,
  ddMul,
  ddSub,
  ddToNumber,
  DD_ZERO,
  type ComplexDD,
  type DD,
} from "./double-double";
import { csqrt, findPolynomialRoots } from "./polynomial";

/** Ladder values from a Darlington synthesis: g1..gn (g1 next to the 1-ohm source) and g(n+1). */
export interface DarlingtonLadder {
  g: number[];
  load: number;
}

/**
 * Synthesize the ladder whose transmission is S21(p) = b0 / B(p), equal 1-ohm terminations
 * (Darlington; see e.g. Matthaei, Young & Jones 1964 sec. 4.07 for the Bessel case):
 *  1. |S11(jω)|² = 1 − |S21(jω)|²  ⇒  F(p)F(−p) = P(p) = B(p)B(−p) − b0², an even polynomial;
 *  2. spectral factorization: roots x_i of P in x = p² (Aberth–Ehrlich, double), p_i = −√x_i (left half
 *     plane), each polished by Newton's method on P(p) in double-double; F(p) = bn · p^m · Π (p − p_i)
 *     (m = half the multiplicity of the root at 0). Left-half-plane zeros put g1 next to the source;
 *  3. Zin(p) = (B + F)/(B − F) and a continued-fraction (Cauer) expansion about p = ∞, in double-double:
 *     Zin = g1 p + 1/(g2 p + 1/(… + remainder)), remainder = load immittance, g(n+1) = its inverse
 *     (the dual kind, per the prototype convention).
 * The expansion multiplies coefficient errors by roughly 30–50 per element, hence the double-double
 * arithmetic (B itself is taken exactly as given in doubles).
 *
 * @param b ascending coefficients of B(p), b0 > 0, bn > 0; scale p first so the coefficients are of
 *   similar size
 * @throws EngineError NO_CONVERGENCE when root finding fails or the expansion loses precision
 *   (a cancelled term that is not small, or a non-positive element value)
 */
export function synthesizeAllPoleLadder(b: readonly number[]): DarlingtonLadder {
  const n = b.length - 1;
  const bd = b.map(dd);
  const even: DD[] = []; // coefficients of P in x = p²: e_k = Σ_(i+j=2k) b_i b_j (−1)^j
  for (let k = 0; k <= n; k++) {
    let acc = DD_ZERO;
    for (let i = Math.max(0, 2 * k - n); i <= Math.min(n, 2 * k); i++) {
      const term = ddMul(bd[i], bd[2 * k - i]);
      acc = (2 * k - i) % 2 === 0 ? ddAdd(acc, term) : ddSub(acc, term);
    }
    even.push(acc);
  }
  even[0] = DD_ZERO; // b0² − b0², exactly
  const scale = Math.max(...even.map((v) => Math.abs(v.hi)));
  let m = 0;
  while (m < n && Math.abs(even[m].hi) <= 1e-28 * scale) m++;
  const xRoots = findPolynomialRoots(even.slice(m).map(ddToNumber));
  const pRoots = xRoots.map((x) => {
    const r = csqrt(x);
    return polishRoot(even, { re: dd(-r.re), im: dd(-r.im) });
  });
  const f = realProductOfRoots(pRoots, m, bd[n]);
  const numerator = bd.map((v, k) => ddAdd(v, f[k]));
  const denominator = bd.map((v, k) => ddSub(v, f[k]));
  return expandContinuedFraction(numerator, denominator, n);
}

/** Newton steps on P(p) = Σ e_k p^(2k) in complex double-double, from a double-precision root. */
function polishRoot(even: readonly DD[], start: ComplexDD): ComplexDD {
  let z = start;
  for (let iter = 0; iter < 4; iter++) {
    const z2 = cddMul(z, z);
    let p: ComplexDD = { re: DD_ZERO, im: DD_ZERO };
    let dq: ComplexDD = { re: DD_ZERO, im: DD_ZERO }; // dP/dx
    for (let k = even.length - 1; k >= 0; k--) {
      dq = cddAdd(cddMul(dq, z2), p);
      p = cddAdd(cddMul(p, z2), { re: even[k], im: DD_ZERO });
    }
    const dp = cddMul(dq, cddAdd(z, z)); // dP/dp = dP/dx · 2p
    const step = cddDiv(p, dp);
    if (!Number.isFinite(step.re.hi) || !Number.isFinite(step.im.hi)) {
      throw new EngineError("NO_CONVERGENCE", "root polishing produced a non-finite step");
    }
    z = cddSub(z, step);
  }
  return z;
}

/** Real coefficients (ascending) of lead · p^m · Π (p − r_i); the conjugate-paired imaginary residue is checked. */
function realProductOfRoots(roots: readonly ComplexDD[], m: number, lead: DD): DD[] {
  let poly: ComplexDD[] = [{ re: lead, im: DD_ZERO }];
  for (const r of roots) {
    const next: ComplexDD[] = new Array(poly.length + 1).fill(null).map(() => ({ re: DD_ZERO, im: DD_ZERO }));
    for (let k = 0; k < poly.length; k++) {
      next[k + 1] = cddAdd(next[k + 1], poly[k]);
      next[k] = cddSub(next[k], cddMul(r, poly[k]));
    }
    poly = next;
  }
  const size = Math.max(...poly.map((c) => Math.abs(c.re.hi)));
  const residue = Math.max(...poly.map((c) => Math.abs(c.im.hi)));
  if (!(residue <= 1e-20 * size)) {
    throw new EngineError("NO_CONVERGENCE", "spectral factor roots are not in conjugate pairs", { details: { residue, size } });
  }
  return [...new Array<DD>(m).fill(DD_ZERO), ...poly.map((c) => c.re)];
}

/**
 * Cauer expansion about infinity of N/D (deg N = deg D + 1): g = lead(N)/lead(D), N ← N − g·p·D with
 * its top coefficient dropped (it cancels), then swap; `n` steps.
 */
function expandContinuedFraction(numerator: DD[], denominator: DD[], n: number): DarlingtonLadder {
  let num = trim(numerator);
  let den = trim(denominator);
  const g: number[] = [];
  let worst = 0;
  for (let step = 0; step < n; step++) {
    if (num.length !== den.length + 1) {
      throw new EngineError("NO_CONVERGENCE", `continued-fraction expansion broke down at element ${step + 1}`);
    }
    const gk = ddDiv(num[num.length - 1], den[den.length - 1]);
    if (!(gk.hi > 0) || !Number.isFinite(gk.hi)) {
      throw new EngineError("NO_CONVERGENCE", `continued-fraction expansion gave a non-positive element g${step + 1}`);
    }
    const rest = num.slice();
    for (let k = 0; k < den.length; k++) rest[k + 1] = ddSub(rest[k + 1], ddMul(gk, den[k]));
    rest.pop();
    // Zin − g·p = O(1/p) when the next arm is again a reactance with a pole at ∞, so the p^(d−1) term
    // of the remainder vanishes too; at the last step the remainder is the constant load.
    if (num.length > 2) {
      const size = Math.max(...num.map((v) => Math.abs(v.hi)));
      worst = Math.max(worst, Math.abs(ddToNumber(rest.pop() as DD)) / size);
    }
    g.push(ddToNumber(gk));
    num = den;
    den = trim(rest);
  }
  if (!(worst <= 1e-10)) {
    throw new EngineError("NO_CONVERGENCE", "continued-fraction expansion lost precision", { details: { residue: worst } });
  }
  // After n steps num and den are constants: remainder immittance = den/num, g(n+1) = its inverse.
  return { g, load: ddToNumber(ddDiv(num[0], den[0])) };
}

function trim(p: DD[]): DD[] {
  const out = p.slice();
  while (out.length > 1 && out[out.length - 1].hi === 0) out.pop();
  return out;
}

/**
 * Root of a continuous function inside a bracket [lo, hi] with f(lo)·f(hi) ≤ 0, by bisection
 * (guaranteed convergence; 1 bit per step).
 * @param tolerance absolute width at which to stop (default 1e-15·max(|lo|, |hi|, 1))
 * @param maxIterations default 200
 * @throws EngineError INVALID_INPUT when the bracket does not change sign; NO_CONVERGENCE when `maxIterations` is reached
 */
export function findBracketedRoot(
  f: (x: number) => number,
  lo: number,
  hi: number,
  tolerance = 1e-15 * Math.max(Math.abs(lo), Math.abs(hi), 1),
  maxIterations = 200,
): number {
  let flo = f(lo);
  const fhi = f(hi);
  if (flo === 0) return lo;
  if (fhi === 0) return hi;
  if (Math.sign(flo) === Math.sign(fhi)) throw new EngineError("INVALID_INPUT", "root is not bracketed");
  for (let iter = 0; iter < maxIterations; iter++) {
    const mid = 0.5 * (lo + hi);
    if (hi - lo <= tolerance || mid === lo || mid === hi) return mid;
    const fm = f(mid);
    if (fm === 0) return mid;
    if (Math.sign(fm) === Math.sign(flo)) {
      lo = mid;
      flo = fm;
    } else hi = mid;
  }
  throw new EngineError("NO_CONVERGENCE", `bracketed root search did not converge in ${maxIterations} iterations`);
}
