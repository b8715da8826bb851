/**
 * Per-frequency slow paths of the Lotwise nodal solver: the general M×M port-block inversion
 * (Gauss-Jordan with partial pivoting, M ≠ 2 distinct port nodes) and the dense fallback that
 * re-solves one frequency of the full nodal system by Gaussian elimination with partial pivoting
 * when a static pivot was tiny. Both write lane q of ws.zb / ws.zbd. No allocation.
 */
import { EngineError } from "./errors";
import { PARAM_C, PARAM_G, PARAM_GAMMA, PARAM_K, PARAM_L, PARAM_R, PARAM_STRIDE } from "./models";
import { FREQ_BLOCK, SINGULAR_TOL, STATIC_PIVOT_TOL } from "./solver-constants";
import type { SweepWorkspace } from "./solver-evaluate";

/**
 * Invert the port block Yp of lane q into zb and form zbd = −Z·Yp'·Z, by Gauss-Jordan with partial
 * pivoting on [Yp | I]. Returns false when a pivot is tiny (the caller then solves densely).
 */
export function invertPortBlockLane(ws: SweepWorkspace, q: number): boolean {
  const { plan, val, der, scale, zb, zbd, tb, gj } = ws;
  const B = FREQ_BLOCK;
  const { blockSlot, blockNodes } = plan;
  const m = blockNodes.length;
  const w2 = 2 * m; // complex columns of [A | I]
  const zo = 2 * m * m * q;
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      const o = 2 * (blockSlot[r * m + c] * B + q);
      gj[2 * (r * w2 + c)] = val[o]; gj[2 * (r * w2 + c) + 1] = val[o + 1];
      gj[2 * (r * w2 + m + c)] = r === c ? 1 : 0; gj[2 * (r * w2 + m + c) + 1] = 0;
    }
  }
  for (let c = 0; c < m; c++) {
    let pr = c, best = -1;
    for (let r = c; r < m; r++) {
      const mag = Math.abs(gj[2 * (r * w2 + c)]) + Math.abs(gj[2 * (r * w2 + c) + 1]);
      if (mag > best) { best = mag; pr = r; }
    }
    if (!(best > STATIC_PIVOT_TOL * scale[blockNodes[c] * B + q])) return false;
    if (pr !== c) {
      for (let x = 0; x < 2 * w2; x++) {
        const t = gj[2 * c * w2 + x]; gj[2 * c * w2 + x] = gj[2 * pr * w2 + x]; gj[2 * pr * w2 + x] = t;
      }
    }
    const pr0 = gj[2 * (c * w2 + c)], pi0 = gj[2 * (c * w2 + c) + 1];
    const id = 1 / (pr0 * pr0 + pi0 * pi0);
    const ir = pr0 * id, ii = -pi0 * id;
    for (let x = 0; x < w2; x++) {
      const o = 2 * (c * w2 + x);
      const ar = gj[o], ai = gj[o + 1];
      gj[o] = ar * ir - ai * ii; gj[o + 1] = ar * ii + ai * ir;
    }
    for (let r = 0; r < m; r++) {
      if (r === c) continue;
      const fr = gj[2 * (r * w2 + c)], fi = gj[2 * (r * w2 + c) + 1];
      if (fr === 0 && fi === 0) continue;
      for (let x = 0; x < w2; x++) {
        const o = 2 * (r * w2 + x), oc = 2 * (c * w2 + x);
        const br = gj[oc], bi = gj[oc + 1];
        gj[o] -= fr * br - fi * bi; gj[o + 1] -= fr * bi + fi * br;
      }
    }
  }
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      const o = 2 * (r * w2 + m + c);
      zb[zo + 2 * (r * m + c)] = gj[o]; zb[zo + 2 * (r * m + c) + 1] = gj[o + 1];
    }
  }
  // tb = Yp'·Z, zbd = −Z·tb
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      let sr = 0, si = 0;
      for (let x = 0; x < m; x++) {
        const o = 2 * (blockSlot[r * m + x] * B + q);
        const ar = der[o], ai = der[o + 1], br = zb[zo + 2 * (x * m + c)], bi = zb[zo + 2 * (x * m + c) + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      tb[2 * (r * m + c)] = sr; tb[2 * (r * m + c) + 1] = si;
    }
  }
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      let sr = 0, si = 0;
      for (let x = 0; x < m; x++) {
        const ar = zb[zo + 2 * (r * m + x)], ai = zb[zo + 2 * (r * m + x) + 1], br = tb[2 * (x * m + c)], bi = tb[2 * (x * m + c) + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      zbd[zo + 2 * (r * m + c)] = -sr; zbd[zo + 2 * (r * m + c) + 1] = -si;
    }
  }
  return true;
}

/**
 * Dense Gaussian elimination with partial pivoting of the full nodal system at frequency index f
 * (lane q of the current block) for the M port-node unit right-hand sides X = Y⁻¹·E; writes lane q
 * of zb (Z on the port nodes) and zbd (Z'_ac = −X_aᵀ·Y'·X_c, X columns being full node responses).
 * @throws EngineError SINGULAR_MATRIX naming the frequency when a pivot is ≤ SINGULAR_TOL of its column scale
 */
export function denseSolvePoint(ws: SweepWorkspace, f: number, q: number): void {
  const { plan, params, denseY: A, denseYd: Ad, denseX: X, denseT: T, scale, zb, zbd, portG } = ws;
  const B = FREQ_BLOCK;
  const n = plan.nodeCount;
  const m = plan.blockNodes.length;
  const zo = 2 * m * m * q;
  const w = ws.omega[f], iw = ws.invOmega[f], iw2 = iw * iw;
  A.fill(0); Ad.fill(0); X.fill(0);
  const { partNodeA, partNodeB, branchParts } = plan;
  let b = 0;
  for (let k = 0; k < partNodeA.length; k++) {
    const o = k * PARAM_STRIDE;
    const c = params[o + PARAM_C], gm = params[o + PARAM_GAMMA];
    let yr = params[o + PARAM_G], yi = w * c - iw * gm, ydr = 0, ydi = c + iw2 * gm;
    if (b < branchParts.length && branchParts[b] === k) {
      b++;
      const r = params[o + PARAM_R], l = params[o + PARAM_L], kc = params[o + PARAM_K];
      if (w === 0 && kc > 0) {
        ydi += 1 / kc;
      } else {
        // branch impedance is nonzero here: the block path already rejected a short
        const zi = w * l - kc * iw;
        const id = 1 / (r * r + zi * zi);
        const br = r * id, bi = -zi * id, zpi = l + kc * iw2;
        yr += br; yi += bi; ydr += 2 * zpi * br * bi; ydi += -zpi * (br * br - bi * bi);
      }
    }
    stampDense(A, Ad, n, partNodeA[k], partNodeB[k], yr, yi, ydr, ydi);
  }
  for (let p = 0; p < plan.portNode.length; p++) A[2 * (plan.portNode[p] * n + plan.portNode[p])] += portG[p];
  for (let c = 0; c < m; c++) X[2 * (plan.blockNodes[c] * m + c)] = 1;
  for (let k = 0; k < n; k++) {
    let pr = k, best = -1;
    for (let r = k; r < n; r++) {
      const mag = Math.abs(A[2 * (r * n + k)]) + Math.abs(A[2 * (r * n + k) + 1]);
      if (mag > best) { best = mag; pr = r; }
    }
    // rows are swapped, columns never: column k stays node k, so its scale is node k's
    if (!(best > SINGULAR_TOL * scale[k * B + q])) {
      const freq = ws.freqs[f];
      throw new EngineError(
        "SINGULAR_MATRIX",
        `nodal matrix is singular at ${freq} Hz: node "${ws.nodeNames[k]}" has no net admittance left there (e.g. a node held only by capacitors at DC, or an isolated LC tank at its resonance)`,
        { details: { freq, node: ws.nodeNames[k] } },
      );
    }
    if (pr !== k) {
      for (let x = 0; x < 2 * n; x++) { const t = A[2 * k * n + x]; A[2 * k * n + x] = A[2 * pr * n + x]; A[2 * pr * n + x] = t; }
      for (let x = 0; x < 2 * m; x++) { const t = X[2 * k * m + x]; X[2 * k * m + x] = X[2 * pr * m + x]; X[2 * pr * m + x] = t; }
    }
    const dr = A[2 * (k * n + k)], di = A[2 * (k * n + k) + 1];
    const id = 1 / (dr * dr + di * di);
    const ir = dr * id, ii = -di * id;
    for (let r = k + 1; r < n; r++) {
      const ar = A[2 * (r * n + k)], ai = A[2 * (r * n + k) + 1];
      if (ar === 0 && ai === 0) continue;
      const fr = ar * ir - ai * ii, fi = ar * ii + ai * ir;
      for (let c = k; c < n; c++) {
        const br = A[2 * (k * n + c)], bi = A[2 * (k * n + c) + 1];
        A[2 * (r * n + c)] -= fr * br - fi * bi; A[2 * (r * n + c) + 1] -= fr * bi + fi * br;
      }
      for (let c = 0; c < m; c++) {
        const br = X[2 * (k * m + c)], bi = X[2 * (k * m + c) + 1];
        X[2 * (r * m + c)] -= fr * br - fi * bi; X[2 * (r * m + c) + 1] -= fr * bi + fi * br;
      }
    }
  }
  for (let k = n - 1; k >= 0; k--) {
    const dr = A[2 * (k * n + k)], di = A[2 * (k * n + k) + 1];
    const id = 1 / (dr * dr + di * di);
    const ir = dr * id, ii = -di * id;
    for (let c = 0; c < m; c++) {
      let sr = X[2 * (k * m + c)], si = X[2 * (k * m + c) + 1];
      for (let x = k + 1; x < n; x++) {
        const ar = A[2 * (k * n + x)], ai = A[2 * (k * n + x) + 1], br = X[2 * (x * m + c)], bi = X[2 * (x * m + c) + 1];
        sr -= ar * br - ai * bi; si -= ar * bi + ai * br;
      }
      X[2 * (k * m + c)] = sr * ir - si * ii; X[2 * (k * m + c) + 1] = sr * ii + si * ir;
    }
  }
  for (let a = 0; a < m; a++) {
    const na = plan.blockNodes[a];
    for (let c = 0; c < m; c++) { zb[zo + 2 * (a * m + c)] = X[2 * (na * m + c)]; zb[zo + 2 * (a * m + c) + 1] = X[2 * (na * m + c) + 1]; }
  }
  for (let c = 0; c < m; c++) {
    for (let r = 0; r < n; r++) {
      let sr = 0, si = 0;
      for (let x = 0; x < n; x++) {
        const ar = Ad[2 * (r * n + x)], ai = Ad[2 * (r * n + x) + 1], br = X[2 * (x * m + c)], bi = X[2 * (x * m + c) + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      T[2 * r] = sr; T[2 * r + 1] = si;
    }
    for (let a = 0; a < m; a++) {
      let sr = 0, si = 0;
      for (let x = 0; x < n; x++) {
        const ar = X[2 * (x * m + a)], ai = X[2 * (x * m + a) + 1], br = T[2 * x], bi = T[2 * x + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      zbd[zo + 2 * (a * m + c)] = -sr; zbd[zo + 2 * (a * m + c) + 1] = -si;
    }
  }
}

function stampDense(A: Float64Array, Ad: Float64Array, n: number, i: number, j: number, yr: number, yi: number, ydr: number, ydi: number): void {
  if (i >= 0) { A[2 * (i * n + i)] += yr; A[2 * (i * n + i) + 1] += yi; Ad[2 * (i * n + i)] += ydr; Ad[2 * (i * n + i) + 1] += ydi; }
  if (j >= 0) { A[2 * (j * n + j)] += yr; A[2 * (j * n + j) + 1] += yi; Ad[2 * (j * n + j)] += ydr; Ad[2 * (j * n + j) + 1] += ydi; }
  if (i >= 0 && j >= 0) {
    A[2 * (i * n + j)] -= yr; A[2 * (i * n + j) + 1] -= yi; Ad[2 * (i * n + j)] -= ydr; Ad[2 * (i * n + j) + 1] -= ydi;
    A[2 * (j * n + i)] -= yr; A[2 * (j * n + i) + 1] -= yi; Ad[2 * (j * n + i)] -= ydr; Ad[2 * (j * n + i) + 1] -= ydi;
  }
}
