/**
 * Spearman rank correlation ρ_s: the Pearson correlation of midranks (tied values share the mean
 * of the ranks they span), C. Spearman, Am. J. Psychol. 15:72–101 (1904). Same definition as
 * simple-statistics' sampleRankCorrelation; ranks are computed once per column here because a
 * sensitivity table correlates every part with every rule.
 */

/** Midranks (0-based) of the values. */
export function midranks(values: ArrayLike<number>): Float64Array {
  const n = values.length;
  const order = Array.from({ length: n }, (_, k) => k).sort((a, b) => values[a] - values[b] || a - b);
  const ranks = new Float64Array(n);
  let i = 0;
  while (i < n) {
    let j = i;
    while (j + 1 < n && values[order[j + 1]] === values[order[i]]) j++;
    const rank = (i + j) / 2;
    for (let k = i; k <= j; k++) ranks[order[k]] = rank;
    i = j + 1;
  }
  return ranks;
}

/** Pearson correlation of two equal-length arrays; null when either has zero variance or n < 3. */
export function pearson(x: ArrayLike<number>, y: ArrayLike<number>): number | null {
  const n = x.length;
  if (n < 3) return null;
  let mx = 0;
  let my = 0;
  for (let k = 0; k < n; k++) {
    mx += x[k];
    my += y[k];
  }
  mx /= n;
  my /= n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let k = 0; k < n; k++) {
    const dx = x[k] - mx;
    const dy = y[k] - my;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  return sxy / Math.sqrt(sxx * syy);
}
