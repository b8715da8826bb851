/**
 * Small dense complex matrices (P ≤ 4) in interleaved Float64Arrays, element (i, j) at
 * (i*P + j)*2 (+1 imag), for the Touchstone Y/Z → S conversion. Pure TypeScript.
 */

/** Gauss-Jordan inverse of a P×P interleaved complex matrix with partial pivoting; undefined if singular. */
export function invertComplex(a: Float64Array, P: number): Float64Array | undefined {
  const w = Float64Array.from(a);
  const inv = new Float64Array(P * P * 2);
  let norm = 0;
  for (let t = 0; t < a.length; t += 2) norm = Math.max(norm, Math.hypot(a[t], a[t + 1]));
  for (let i = 0; i < P; i++) inv[(i * P + i) * 2] = 1;
  for (let c = 0; c < P; c++) {
    let piv = c;
    for (let r = c + 1; r < P; r++) if (cabs(w, r, c, P) > cabs(w, piv, c, P)) piv = r;
    if (!(cabs(w, piv, c, P) > 1e-13 * norm)) return undefined;
    swapRows(w, c, piv, P);
    swapRows(inv, c, piv, P);
    const pr = w[(c * P + c) * 2];
    const pi = w[(c * P + c) * 2 + 1];
    const d = pr * pr + pi * pi;
    const ir = pr / d;
    const ii = -pi / d;
    scaleRow(w, c, ir, ii, P);
    scaleRow(inv, c, ir, ii, P);
    for (let r = 0; r < P; r++) {
      if (r === c) continue;
      const fr = w[(r * P + c) * 2];
      const fi = w[(r * P + c) * 2 + 1];
      subtractRow(w, r, c, fr, fi, P);
      subtractRow(inv, r, c, fr, fi, P);
    }
  }
  return inv;
}

function cabs(m: Float64Array, r: number, c: number, P: number): number {
  return Math.hypot(m[(r * P + c) * 2], m[(r * P + c) * 2 + 1]);
}

function swapRows(m: Float64Array, a: number, b: number, P: number): void {
  if (a === b) return;
  for (let t = 0; t < 2 * P; t++) {
    const x = m[a * P * 2 + t];
    m[a * P * 2 + t] = m[b * P * 2 + t];
    m[b * P * 2 + t] = x;
  }
}

function scaleRow(m: Float64Array, r: number, sr: number, si: number, P: number): void {
  for (let j = 0; j < P; j++) {
    const k = (r * P + j) * 2;
    const re = m[k];
    m[k] = re * sr - m[k + 1] * si;
    m[k + 1] = re * si + m[k + 1] * sr;
  }
}

/** row r −= (fr + j·fi) · row c */
function subtractRow(m: Float64Array, r: number, c: number, fr: number, fi: number, P: number): void {
  for (let j = 0; j < P; j++) {
    const kc = (c * P + j) * 2;
    const kr = (r * P + j) * 2;
    m[kr] -= fr * m[kc] - fi * m[kc + 1];
    m[kr + 1] -= fr * m[kc + 1] + fi * m[kc];
  }
}

/** out := a·b (P×P interleaved complex). */
export function multiplyComplex(a: Float64Array, b: Float64Array, P: number, out: Float64Array): void {
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < P; k++) {
        const ar = a[(i * P + k) * 2];
        const ai = a[(i * P + k) * 2 + 1];
        const br = b[(k * P + j) * 2];
        const bi = b[(k * P + j) * 2 + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      out[(i * P + j) * 2] = re;
      out[(i * P + j) * 2 + 1] = im;
    }
  }
}
