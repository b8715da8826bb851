/**
 * Fixed-bin histograms: bin edges are fixed before any data arrive, so histograms from
 * different chunks of trials merge by adding counts (exact, order-independent).
 *
 * Layout of a `counts` slice of length bins + 2: [underflow, bin 0, …, bin (bins−1), overflow].
 * Bin k covers [lo + k·w, lo + (k+1)·w), w = (hi − lo)/bins; x < lo is underflow, x ≥ hi overflow.
 */

/** Edges of a fixed-bin histogram. */
export interface HistogramEdges {
  /** lower edge of bin 0 */
  lo: number;
  /** upper edge of the last bin */
  hi: number;
  /** number of bins (excluding underflow and overflow) */
  bins: number;
}

/** A finalized histogram with named fields. */
export interface Histogram extends HistogramEdges {
  binWidth: number;
  counts: number[];
  underflow: number;
  overflow: number;
}

/**
 * Slot of x in a counts slice (0 = underflow, bins + 1 = overflow).
 * The arithmetic is the same on every worker, so a value always lands in the same bin.
 */
export function histogramSlot(lo: number, invWidth: number, bins: number, x: number): number {
  const k = Math.floor((x - lo) * invWidth);
  if (k < 0 || Number.isNaN(k)) return 0;
  if (k >= bins) return bins + 1;
  return k + 1;
}

/** Adds the counts of b into a element-wise (both the same length). */
export function addCounts(a: Float64Array | Uint32Array, b: Float64Array | Uint32Array): void {
  for (let k = 0; k < a.length; k++) a[k] += b[k];
}

/** Builds the named-field histogram from a counts slice. */
export function toHistogram(edges: HistogramEdges, slice: ArrayLike<number>): Histogram {
  const counts: number[] = [];
  for (let k = 1; k <= edges.bins; k++) counts.push(slice[k]);
  return { ...edges, binWidth: (edges.hi - edges.lo) / edges.bins, counts, underflow: slice[0], overflow: slice[edges.bins + 1] };
}

/**
 * The q-quantile (0 ≤ q ≤ 1) of the data in a counts slice, by linear interpolation inside the bin
 * that holds rank q·N (N = total count). Resolution: one bin width. A quantile that falls into the
 * underflow (overflow) returns lo (hi) and sets `clipped`.
 */
export function histogramQuantile(
  lo: number,
  width: number,
  bins: number,
  slice: ArrayLike<number>,
  offset: number,
  q: number,
): { value: number; clipped: boolean } {
  let total = 0;
  for (let k = 0; k < bins + 2; k++) total += slice[offset + k];
  if (total === 0) return { value: NaN, clipped: false };
  const target = q * total;
  let cum = slice[offset];
  if (target < cum || (cum > 0 && target === 0)) return { value: lo, clipped: true };
  for (let k = 0; k < bins; k++) {
    const c = slice[offset + 1 + k];
    if (c > 0 && cum + c >= target) {
      const frac = (target - cum) / c;
      return { value: lo + (k + frac) * width, clipped: false };
    }
    cum += c;
  }
  return { value: lo + bins * width, clipped: slice[offset + bins + 1] > 0 };
}
