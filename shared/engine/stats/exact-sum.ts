/**
 * Exact, order-independent floating-point summation (Shewchuk's adaptive partials, as in
 * J. R. Shewchuk, "Adaptive Precision Floating-Point Arithmetic and Fast Robust Geometric
 * Predicates", Discrete Comput. Geom. 18:305–363, 1997, and the "msum"/fsum recipe).
 *
 * An accumulator is a list of non-overlapping partials whose exact sum equals the exact sum of
 * everything added. Merging two accumulators adds one's partials into the other, so the exact
 * value does not depend on how trials were split into chunks, and `exactSumValue` rounds that
 * exact value correctly (round-half-even), so the reported number is bit-identical whatever the
 * chunking or merge order.
 */

/** Partials of an exact sum (plain array so it serializes as JSON). */
export type ExactSum = number[];

/** Adds x into the partials in place (x must be finite). */
export function exactSumAdd(partials: ExactSum, x: number): void {
  let n = 0;
  for (let k = 0; k < partials.length; k++) {
    let y = partials[k];
    if (Math.abs(x) < Math.abs(y)) {
      const t = x;
      x = y;
      y = t;
    }
    const hi = x + y;
    const lo = y - (hi - x);
    if (lo !== 0) partials[n++] = lo;
    x = hi;
  }
  partials.length = n;
  partials.push(x);
}

/** Adds every partial of b into a (in place) and returns a. */
export function exactSumMerge(a: ExactSum, b: readonly number[]): ExactSum {
  for (let k = 0; k < b.length; k++) exactSumAdd(a, b[k]);
  return a;
}

/** The correctly rounded value of the exact sum (0 for no partials). */
export function exactSumValue(partials: readonly number[]): number {
  let n = partials.length;
  if (n === 0) return 0;
  let hi = partials[--n];
  let lo = 0;
  while (n > 0) {
    const x = hi;
    const y = partials[--n];
    hi = x + y;
    const yr = hi - x;
    lo = y - yr;
    if (lo !== 0) break;
  }
  // Half-way case: make the rounding of hi + lo correct when the rest of the partials push it.
  if (n > 0 && ((lo < 0 && partials[n - 1] < 0) || (lo > 0 && partials[n - 1] > 0))) {
    const y = lo * 2;
    const x = hi + y;
    const yr = x - hi;
    if (y === yr) hi = x;
  }
  return hi;
}

/**
 * Rewrites the partials in place into the canonical expansion of their exact value: v1 = the correctly
 * rounded sum, v2 = the correctly rounded remainder, … (stored smallest first). The result depends on
 * the exact value only, so two accumulators of the same numbers serialize identically whatever order
 * they were added in. Each v_(k+1) is at most half an ulp of v_k, so the list stays non-overlapping.
 */
export function exactSumCanonicalize(partials: ExactSum): ExactSum {
  const out: number[] = [];
  for (let guard = 0; guard < 64 && partials.length > 0; guard++) {
    const v = exactSumValue(partials);
    if (v === 0) break;
    out.push(v);
    exactSumAdd(partials, -v);
    while (partials.length > 0 && partials[partials.length - 1] === 0) partials.pop();
  }
  partials.length = 0;
  for (let k = out.length - 1; k >= 0; k--) partials.push(out[k]);
  return partials;
}
