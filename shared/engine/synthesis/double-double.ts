/**
 * Double-double arithmetic (about 32 significant digits: value = hi + lo, |lo| ≤ ulp(hi)/2), after
 * T. J. Dekker, Numer. Math. 18 (1971) 224–242, and Hida, Li & Bailey, "Library for double-double and
 * quad-double arithmetic" (2001). Used only by the Darlington synthesis, whose continued-fraction
 * expansion multiplies coefficient errors by tens per element.
 */

export interface DD {
  hi: number;
  lo: number;
}
export interface ComplexDD {
  re: DD;
  im: DD;
}

export const DD_ZERO: DD = { hi: 0, lo: 0 };

export function dd(x: number): DD {
  return { hi: x, lo: 0 };
}

export function ddToNumber(a: DD): number {
  return a.hi + a.lo;
}

export function ddNeg(a: DD): DD {
  return { hi: -a.hi, lo: -a.lo };
}

export function ddAdd(a: DD, b: DD): DD {
  let s = a.hi + b.hi;
  let bb = s - a.hi;
  let e = a.hi - (s - bb) + (b.hi - bb);
  const t = a.lo + b.lo;
  bb = t - a.lo;
  const f = a.lo - (t - bb) + (b.lo - bb);
  e += t;
  let hi = s + e;
  e = e - (hi - s);
  e += f;
  s = hi + e;
  return { hi: s, lo: e - (s - hi) };
}

export function ddSub(a: DD, b: DD): DD {
  return ddAdd(a, ddNeg(b));
}

export function ddMul(a: DD, b: DD): DD {
  const p = a.hi * b.hi;
  const [ah, al] = split(a.hi);
  const [bh, bl] = split(b.hi);
  let e = ah * bh - p + ah * bl + al * bh + al * bl;
  e += a.hi * b.lo + a.lo * b.hi;
  const hi = p + e;
  return { hi, lo: e - (hi - p) };
}

export function ddDiv(a: DD, b: DD): DD {
  const q1 = a.hi / b.hi;
  let r = ddSub(a, ddMul(dd(q1), b));
  const q2 = r.hi / b.hi;
  r = ddSub(r, ddMul(dd(q2), b));
  const q3 = r.hi / b.hi;
  return ddAdd(ddAdd(dd(q1), dd(q2)), dd(q3));
}

export function cddAdd(a: ComplexDD, b: ComplexDD): ComplexDD {
  return { re: ddAdd(a.re, b.re), im: ddAdd(a.im, b.im) };
}

export function cddSub(a: ComplexDD, b: ComplexDD): ComplexDD {
  return { re: ddSub(a.re, b.re), im: ddSub(a.im, b.im) };
}

export function cddMul(a: ComplexDD, b: ComplexDD): ComplexDD {
  return {
    re: ddSub(ddMul(a.re, b.re), ddMul(a.im, b.im)),
    im: ddAdd(ddMul(a.re, b.im), ddMul(a.im, b.re)),
  };
}

export function cddDiv(a: ComplexDD, b: ComplexDD): ComplexDD {
  const d = ddAdd(ddMul(b.re, b.re), ddMul(b.im, b.im));
  const re = ddAdd(ddMul(a.re, b.re), ddMul(a.im, b.im));
  const im = ddSub(ddMul(a.im, b.re), ddMul(a.re, b.im));
  return { re: ddDiv(re, d), im: ddDiv(im, d) };
}

/** Dekker's split of a double into two 26-bit halves. */
function split(a: number): [number, number] {
  const t = 134217729 * a; // 2^27 + 1
  const hi = t - (t - a);
  return [hi, a - hi];
}
