/**
 * Numeric hot path of the Lotwise nodal solver: per frequency, stamp the complex nodal matrix Y(ω)
 * and its derivative Y'(ω) = dY/dω into the compiled slots, eliminate the internal nodes with a
 * static-pivot LDLᵀ (Y is complex symmetric for R/L/C networks, so L·D·Lᵀ is its LU), carrying the
 * derivative of every entry along (forward-mode differentiation of the elimination), invert the
 * remaining port-node block (the port admittance matrix Yp, terminations included) with partial
 * pivoting, and form S and group delay:
 *
 *   Z = Yp⁻¹,   Z' = −Z·Yp'·Z,   S_ij = 2·Z_ij/√(z0i·z0j) − δij,   S'_ij = 2·Z'_ij/√(z0i·z0j)
 *   gd_ij = −dφ_ij/dω = −Im(S'_ij / S_ij) = −Im(S'_ij·conj(S_ij)) / |S_ij|²   (0 when S_ij = 0)
 *
 * Derivation of S: port j driven by Vs_j behind z0j is the Norton current Vs_j/z0j into its node with
 * 1/z0j to ground (stamped into Y); then V_i = Z_ij·Vs_j/z0j and S_ij = 2·V_i/Vs_j·√(z0j/z0i) − δij.
 * Z' = −Z·Yp'·Z is dV/dω = −Y⁻¹(dY/dω)V restricted to the ports, with the same factorization.
 *
 * When a static pivot is tiny against its row's admittance scale (|d| ≤ 1e-6·Σ|y| — an LC
 * resonance can cancel a diagonal), that frequency is redone by dense Gaussian elimination with
 * partial pivoting; if a pivot there is ≤ 1e-13 of its column scale the system is singular and
 * EngineError SINGULAR_MATRIX names the frequency. Backward error of the static path is about
 * ε/1e-6 ≈ 2e-10 relative at worst, far below the tolerance data of any part.
 */
import { EngineError } from "./errors";
import { PARAM_C, PARAM_G, PARAM_GAMMA, PARAM_K, PARAM_L, PARAM_R, PARAM_STRIDE } from "./models";
import type { SolverPlan } from "./solver-compile";

/** Static pivot acceptance: |pivot|₁ > STATIC_PIVOT_TOL · (row admittance scale). */
export const STATIC_PIVOT_TOL = 1e-6;
/** Dense fallback: |pivot|₁ ≤ SINGULAR_TOL · (column admittance scale) is singular. */
export const SINGULAR_TOL = 1e-13;

/** Scratch and output storage of one evaluator, allocated once. */
export interface SweepWorkspace {
  readonly plan: SolverPlan;
  readonly nodeNames: readonly string[];
  readonly partRefs: readonly string[];
  readonly portCount: number;
  readonly freqs: Float64Array;
  readonly omega: Float64Array;
  readonly invOmega: Float64Array;
  /** Per-trial real stamp data: per slot G, C, Γ and per node their absolute sums (row scales). */
  readonly params: Float64Array;
  readonly slotG: Float64Array;
  readonly slotC: Float64Array;
  readonly slotGam: Float64Array;
  readonly nodeSG: Float64Array;
  readonly nodeSC: Float64Array;
  readonly nodeSGam: Float64Array;
  /** Per-port factor 2/√(z0i z0j), P×P; and 1/z0 per port. */
  readonly sFactor: Float64Array;
  readonly portG: Float64Array;
  /** Per-frequency complex (interleaved) data. */
  readonly val: Float64Array;
  readonly der: Float64Array;
  readonly scale: Float64Array;
  readonly branchY: Float64Array;
  readonly branchYd: Float64Array;
  readonly nbL: Float64Array;
  readonly nbLd: Float64Array;
  readonly nbU: Float64Array;
  readonly nbUd: Float64Array;
  readonly blockScale: Float64Array;
  readonly gj: Float64Array;
  readonly zb: Float64Array;
  readonly zbd: Float64Array;
  readonly tb: Float64Array;
  /** Dense fallback storage (N×N, N×M, N). */
  readonly denseY: Float64Array;
  readonly denseYd: Float64Array;
  readonly denseX: Float64Array;
  readonly denseT: Float64Array;
  readonly s: Float64Array;
  readonly gd: Float64Array;
}

/** Allocate the workspace for a plan and a frequency list (Hz, already validated). */
export function createWorkspace(plan: SolverPlan, nodeNames: readonly string[], partRefs: readonly string[], z0: Float64Array, freqs: Float64Array): SweepWorkspace {
  const n = plan.nodeCount;
  const m = plan.blockNodes.length;
  const p = z0.length;
  const nf = freqs.length;
  const omega = new Float64Array(nf);
  const invOmega = new Float64Array(nf);
  for (let f = 0; f < nf; f++) {
    omega[f] = 2 * Math.PI * freqs[f];
    // At DC there is no ideal inductor (rejected by the caller), so every Γ is 0 and 1/ω may be 0.
    invOmega[f] = omega[f] === 0 ? 0 : 1 / omega[f];
  }
  const sFactor = new Float64Array(p * p);
  const portG = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    portG[i] = 1 / z0[i];
    for (let j = 0; j < p; j++) sFactor[i * p + j] = 2 / Math.sqrt(z0[i] * z0[j]);
  }
  const nb = plan.nbSlot.length;
  const nbr = plan.branchParts.length;
  const parts = plan.partNodeA.length;
  return {
    plan, nodeNames, partRefs, portCount: p, freqs, omega, invOmega,
    params: new Float64Array(parts * PARAM_STRIDE),
    slotG: new Float64Array(plan.slotCount), slotC: new Float64Array(plan.slotCount), slotGam: new Float64Array(plan.slotCount),
    nodeSG: new Float64Array(n), nodeSC: new Float64Array(n), nodeSGam: new Float64Array(n),
    sFactor, portG,
    val: new Float64Array(2 * plan.slotCount), der: new Float64Array(2 * plan.slotCount), scale: new Float64Array(n),
    branchY: new Float64Array(2 * nbr), branchYd: new Float64Array(2 * nbr),
    nbL: new Float64Array(2 * nb), nbLd: new Float64Array(2 * nb), nbU: new Float64Array(2 * nb), nbUd: new Float64Array(2 * nb),
    blockScale: new Float64Array(m), gj: new Float64Array(4 * m * m),
    zb: new Float64Array(2 * m * m), zbd: new Float64Array(2 * m * m), tb: new Float64Array(2 * m * m),
    denseY: new Float64Array(2 * n * n), denseYd: new Float64Array(2 * n * n), denseX: new Float64Array(2 * n * m), denseT: new Float64Array(2 * n),
    s: new Float64Array(2 * nf * p * p), gd: new Float64Array(nf * p * p),
  };
}

/**
 * Per-trial real stamps: slot sums of g, c, γ over the parts (port terminations in G) and the
 * per-node absolute sums used as row scales. `ws.params` must hold the trial's part parameters.
 */
export function stampTrial(ws: SweepWorkspace): void {
  const { plan, params, slotG, slotC, slotGam, nodeSG, nodeSC, nodeSGam, portG } = ws;
  slotG.fill(0); slotC.fill(0); slotGam.fill(0);
  nodeSG.fill(0); nodeSC.fill(0); nodeSGam.fill(0);
  const { partDiagA, partDiagB, partOff } = plan;
  for (let k = 0; k < partOff.length; k++) {
    const o = k * PARAM_STRIDE;
    const g = params[o + PARAM_G], c = params[o + PARAM_C], gm = params[o + PARAM_GAMMA];
    const da = partDiagA[k], db = partDiagB[k], off = partOff[k];
    if (da >= 0) { slotG[da] += g; slotC[da] += c; slotGam[da] += gm; nodeSG[da] += g; nodeSC[da] += c; nodeSGam[da] += gm; }
    if (db >= 0) { slotG[db] += g; slotC[db] += c; slotGam[db] += gm; nodeSG[db] += g; nodeSC[db] += c; nodeSGam[db] += gm; }
    if (off >= 0) { slotG[off] -= g; slotC[off] -= c; slotGam[off] -= gm; }
  }
  const { portNode } = plan;
  for (let p = 0; p < portNode.length; p++) {
    slotG[portNode[p]] += portG[p];
    nodeSG[portNode[p]] += portG[p];
  }
}

/** Solve every frequency for the stamped trial and write ws.s and ws.gd. Allocates nothing. */
export function solveSweep(ws: SweepWorkspace): void {
  const { plan, omega, invOmega, slotG, slotC, slotGam, nodeSG, nodeSC, nodeSGam, val, der, scale, params, branchY, branchYd } = ws;
  const { nbL, nbLd, nbU, nbUd } = ws;
  const { branchParts, partDiagA, partDiagB, partOff, pivotNode, nbStart, nbSlot, updStart, updTarget, updA, updB } = plan;
  const slotCount = plan.slotCount;
  const n = plan.nodeCount;
  const nPiv = pivotNode.length;
  const nBranch = branchParts.length;
  const nf = omega.length;
  for (let f = 0; f < nf; f++) {
    const w = omega[f];
    const iw = invOmega[f];
    const iw2 = iw * iw;
    // Y = G + j(ωC − Γ/ω),  Y' = j(C + Γ/ω²)
    for (let s = 0; s < slotCount; s++) {
      const c = slotC[s], gm = slotGam[s];
      val[2 * s] = slotG[s];
      val[2 * s + 1] = w * c - iw * gm;
      der[2 * s] = 0;
      der[2 * s + 1] = c + iw2 * gm;
    }
    for (let v = 0; v < n; v++) scale[v] = nodeSG[v] + w * nodeSC[v] + iw * nodeSGam[v];
    // Series R-L-C branches: y = 1/z, z = r + j(ωl − k/ω), y' = −z'·y², z' = j(l + k/ω²)
    for (let b = 0; b < nBranch; b++) {
      const k = branchParts[b];
      const o = k * PARAM_STRIDE;
      const r = params[o + PARAM_R], l = params[o + PARAM_L], kc = params[o + PARAM_K];
      let yr: number, yi: number, ydr: number, ydi: number;
      if (w === 0 && kc > 0) {
        // Series capacitor at DC: open circuit, y ≈ jω/k so y' = j/k.
        yr = 0; yi = 0; ydr = 0; ydi = 1 / kc;
      } else {
        const zi = w * l - kc * iw;
        const den = r * r + zi * zi;
        if (!(den > 0)) throw branchShort(ws, f, k);
        yr = r / den;
        yi = -zi / den;
        const zpi = l + kc * iw2;
        const a = yr * yr - yi * yi, bb = 2 * yr * yi;
        ydr = zpi * bb;
        ydi = -zpi * a;
      }
      branchY[2 * b] = yr; branchY[2 * b + 1] = yi; branchYd[2 * b] = ydr; branchYd[2 * b + 1] = ydi;
      const mag = Math.abs(yr) + Math.abs(yi);
      const da = partDiagA[k], db = partDiagB[k], off = partOff[k];
      if (da >= 0) { val[2 * da] += yr; val[2 * da + 1] += yi; der[2 * da] += ydr; der[2 * da + 1] += ydi; scale[da] += mag; }
      if (db >= 0) { val[2 * db] += yr; val[2 * db + 1] += yi; der[2 * db] += ydr; der[2 * db + 1] += ydi; scale[db] += mag; }
      if (off >= 0) { val[2 * off] -= yr; val[2 * off + 1] -= yi; der[2 * off] -= ydr; der[2 * off + 1] -= ydi; }
    }
    // Static-pivot elimination of the internal nodes, carrying derivatives.
    let ok = true;
    for (let t = 0; t < nPiv; t++) {
      const kd = pivotNode[t];
      const dr = val[2 * kd], di = val[2 * kd + 1];
      if (!(Math.abs(dr) + Math.abs(di) > STATIC_PIVOT_TOL * scale[kd])) { ok = false; break; }
      const den = dr * dr + di * di;
      const ir = dr / den, ii = -di / den;
      // (1/d)' = −d'·(1/d)²
      const qr = ir * ir - ii * ii, qi = 2 * ir * ii;
      const dpr = der[2 * kd], dpi = der[2 * kd + 1];
      const idr = -(dpr * qr - dpi * qi), idi = -(dpr * qi + dpi * qr);
      const q1 = nbStart[t + 1];
      for (let q = nbStart[t]; q < q1; q++) {
        const s = nbSlot[q];
        const ur = val[2 * s], ui = val[2 * s + 1], upr = der[2 * s], upi = der[2 * s + 1];
        nbU[2 * q] = ur; nbU[2 * q + 1] = ui; nbUd[2 * q] = upr; nbUd[2 * q + 1] = upi;
        nbL[2 * q] = ur * ir - ui * ii; nbL[2 * q + 1] = ur * ii + ui * ir;
        nbLd[2 * q] = upr * ir - upi * ii + ur * idr - ui * idi;
        nbLd[2 * q + 1] = upr * ii + upi * ir + ur * idi + ui * idr;
      }
      const e1 = updStart[t + 1];
      for (let e = updStart[t]; e < e1; e++) {
        const tg = updTarget[e], a = updA[e], b = updB[e];
        const lr = nbL[2 * a], li = nbL[2 * a + 1], ldr = nbLd[2 * a], ldi = nbLd[2 * a + 1];
        const ur = nbU[2 * b], ui = nbU[2 * b + 1], udr = nbUd[2 * b], udi = nbUd[2 * b + 1];
        val[2 * tg] -= lr * ur - li * ui;
        val[2 * tg + 1] -= lr * ui + li * ur;
        der[2 * tg] -= ldr * ur - ldi * ui + lr * udr - li * udi;
        der[2 * tg + 1] -= ldr * ui + ldi * ur + lr * udi + li * udr;
      }
    }
    if (!ok || !invertPortBlock(ws)) denseSolvePoint(ws, f);
    writeSParams(ws, f);
  }
}

/**
 * Invert the port block Yp (M×M, in the block slots) into zb and form zbd = −Z·Yp'·Z, by Gauss-Jordan
 * with partial pivoting. Returns false when a pivot is tiny (the caller then solves densely).
 */
function invertPortBlock(ws: SweepWorkspace): boolean {
  const { plan, val, der, scale, zb, zbd, tb, gj } = ws;
  const { blockSlot, blockNodes } = plan;
  const m = blockNodes.length;
  if (m === 2) return invertPortBlock2(ws);
  const w2 = 2 * m; // complex columns of [A | I]
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      const s = blockSlot[r * m + c];
      gj[2 * (r * w2 + c)] = val[2 * s]; gj[2 * (r * w2 + c) + 1] = val[2 * s + 1];
      gj[2 * (r * w2 + m + c)] = r === c ? 1 : 0; gj[2 * (r * w2 + m + c) + 1] = 0;
    }
  }
  for (let c = 0; c < m; c++) {
    let pr = c, best = -1;
    for (let r = c; r < m; r++) {
      const mag = Math.abs(gj[2 * (r * w2 + c)]) + Math.abs(gj[2 * (r * w2 + c) + 1]);
      if (mag > best) { best = mag; pr = r; }
    }
    if (!(best > STATIC_PIVOT_TOL * scale[blockNodes[c]])) return false;
    if (pr !== c) {
      for (let x = 0; x < 2 * w2; x++) {
        const t = gj[2 * c * w2 + x]; gj[2 * c * w2 + x] = gj[2 * pr * w2 + x]; gj[2 * pr * w2 + x] = t;
      }
    }
    const pr0 = gj[2 * (c * w2 + c)], pi0 = gj[2 * (c * w2 + c) + 1];
    const den = pr0 * pr0 + pi0 * pi0;
    const ir = pr0 / den, ii = -pi0 / den;
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
      zb[2 * (r * m + c)] = gj[o]; zb[2 * (r * m + c) + 1] = gj[o + 1];
    }
  }
  // tb = Yp'·Z, zbd = −Z·tb
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      let sr = 0, si = 0;
      for (let x = 0; x < m; x++) {
        const s = blockSlot[r * m + x];
        const ar = der[2 * s], ai = der[2 * s + 1], br = zb[2 * (x * m + c)], bi = zb[2 * (x * m + c) + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      tb[2 * (r * m + c)] = sr; tb[2 * (r * m + c) + 1] = si;
    }
  }
  for (let r = 0; r < m; r++) {
    for (let c = 0; c < m; c++) {
      let sr = 0, si = 0;
      for (let x = 0; x < m; x++) {
        const ar = zb[2 * (r * m + x)], ai = zb[2 * (r * m + x) + 1], br = tb[2 * (x * m + c)], bi = tb[2 * (x * m + c) + 1];
        sr += ar * br - ai * bi; si += ar * bi + ai * br;
      }
      zbd[2 * (r * m + c)] = -sr; zbd[2 * (r * m + c) + 1] = -si;
    }
  }
  return true;
}

/**
 * Two distinct port nodes: Z = [d −b; −b a]/(ad − b²) for the symmetric block [a b; b d], and
 * Z' = −Z·Yp'·Z written out. Returns false when the determinant is tiny against a·d and b².
 */
function invertPortBlock2(ws: SweepWorkspace): boolean {
  const { plan, val, der, zb, zbd } = ws;
  const bs = plan.blockSlot;
  const sa = bs[0], sb = bs[1], sd = bs[3];
  const ar = val[2 * sa], ai = val[2 * sa + 1], br = val[2 * sb], bi = val[2 * sb + 1], dr = val[2 * sd], di = val[2 * sd + 1];
  const adr = ar * dr - ai * di, adi = ar * di + ai * dr;
  const bbr = br * br - bi * bi, bbi = 2 * br * bi;
  const detr = adr - bbr, deti = adi - bbi;
  const detMag = Math.abs(detr) + Math.abs(deti);
  if (!(detMag > STATIC_PIVOT_TOL * (Math.abs(adr) + Math.abs(adi) + Math.abs(bbr) + Math.abs(bbi)))) return false;
  const den = detr * detr + deti * deti;
  const ir = detr / den, ii = -deti / den;
  // Z entries
  const z11r = dr * ir - di * ii, z11i = dr * ii + di * ir;
  const z22r = ar * ir - ai * ii, z22i = ar * ii + ai * ir;
  const z12r = -(br * ir - bi * ii), z12i = -(br * ii + bi * ir);
  zb[0] = z11r; zb[1] = z11i; zb[2] = z12r; zb[3] = z12i; zb[4] = z12r; zb[5] = z12i; zb[6] = z22r; zb[7] = z22i;
  // T = Yp'·Z (Yp' symmetric [pa pb; pb pd])
  const par = der[2 * sa], pai = der[2 * sa + 1], pbr = der[2 * sb], pbi = der[2 * sb + 1], pdr = der[2 * sd], pdi = der[2 * sd + 1];
  const t11r = par * z11r - pai * z11i + pbr * z12r - pbi * z12i, t11i = par * z11i + pai * z11r + pbr * z12i + pbi * z12r;
  const t12r = par * z12r - pai * z12i + pbr * z22r - pbi * z22i, t12i = par * z12i + pai * z12r + pbr * z22i + pbi * z22r;
  const t21r = pbr * z11r - pbi * z11i + pdr * z12r - pdi * z12i, t21i = pbr * z11i + pbi * z11r + pdr * z12i + pdi * z12r;
  const t22r = pbr * z12r - pbi * z12i + pdr * z22r - pdi * z22i, t22i = pbr * z12i + pbi * z12r + pdr * z22i + pdi * z22r;
  // Z' = −Z·T (symmetric: compute 11, 12, 22)
  const d11r = z11r * t11r - z11i * t11i + z12r * t21r - z12i * t21i, d11i = z11r * t11i + z11i * t11r + z12r * t21i + z12i * t21r;
  const d12r = z11r * t12r - z11i * t12i + z12r * t22r - z12i * t22i, d12i = z11r * t12i + z11i * t12r + z12r * t22i + z12i * t22r;
  const d22r = z12r * t12r - z12i * t12i + z22r * t22r - z22i * t22i, d22i = z12r * t12i + z12i * t12r + z22r * t22i + z22i * t22r;
  zbd[0] = -d11r; zbd[1] = -d11i; zbd[2] = -d12r; zbd[3] = -d12i; zbd[4] = -d12r; zbd[5] = -d12i; zbd[6] = -d22r; zbd[7] = -d22i;
  return true;
}

/** S_ij and gd_ij from zb/zbd for i ≤ j, mirrored (Z is symmetric for a reciprocal network). */
function writeSParams(ws: SweepWorkspace, f: number): void {
  const { plan, zb, zbd, sFactor, s, gd } = ws;
  const p = ws.portCount;
  const m = plan.blockNodes.length;
  const portBlock = plan.portBlock;
  for (let i = 0; i < p; i++) {
    const bi = portBlock[i];
    for (let j = i; j < p; j++) {
      const o = 2 * (bi * m + portBlock[j]);
      const kf = sFactor[i * p + j];
      const sr = kf * zb[o] - (i === j ? 1 : 0), si = kf * zb[o + 1];
      const dr = kf * zbd[o], di = kf * zbd[o + 1];
      const m2 = sr * sr + si * si;
      // −Im(S'·conj S)/|S|²; the phase of an exactly vanishing S_ij is undefined: report 0.
      const g = m2 > 1e-280 ? -(di * sr - dr * si) / m2 : 0;
      if (!(Math.abs(sr) + Math.abs(si) + Math.abs(g) < Infinity)) throw nonFinite(ws, f);
      const ij = (f * p + i) * p + j, ji = (f * p + j) * p + i;
      s[2 * ij] = sr; s[2 * ij + 1] = si; s[2 * ji] = sr; s[2 * ji + 1] = si;
      gd[ij] = g; gd[ji] = g;
    }
  }
}

/**
 * Dense Gaussian elimination with partial pivoting of the full nodal system at frequency index f,
 * for the M port-node unit right-hand sides; writes zb and zbd (Z' = −Xᵀ·Y'·X on the ports).
 */
function denseSolvePoint(ws: SweepWorkspace, f: number): void {
  const { plan, params, branchY, branchYd, denseY: A, denseYd: Ad, denseX: X, denseT: T, scale, zb, zbd, portG } = ws;
  const n = plan.nodeCount;
  const m = plan.blockNodes.length;
  const w = ws.omega[f], iw = ws.invOmega[f], iw2 = iw * iw;
  A.fill(0); Ad.fill(0); X.fill(0);
  const { partNodeA, partNodeB, branchParts } = plan;
  const nParts = partNodeA.length;
  let b = 0;
  for (let k = 0; k < nParts; k++) {
    const o = k * PARAM_STRIDE;
    const c = params[o + PARAM_C], gm = params[o + PARAM_GAMMA];
    let yr = params[o + PARAM_G], yi = w * c - iw * gm, ydr = 0, ydi = c + iw2 * gm;
    if (b < branchParts.length && branchParts[b] === k) {
      yr += branchY[2 * b]; yi += branchY[2 * b + 1]; ydr += branchYd[2 * b]; ydi += branchYd[2 * b + 1];
      b++;
    }
    stampDense(A, Ad, n, partNodeA[k], partNodeB[k], yr, yi, ydr, ydi);
  }
  for (let p = 0; p < plan.portNode.length; p++) A[2 * (plan.portNode[p] * n + plan.portNode[p])] += portG[p];
  for (let c = 0; c < m; c++) X[2 * (plan.blockNodes[c] * m + c)] = 1;
  // Forward elimination on a copy kept in A (Ad stays intact for the derivative).
  for (let k = 0; k < n; k++) {
    let pr = k, best = -1;
    for (let r = k; r < n; r++) {
      const mag = Math.abs(A[2 * (r * n + k)]) + Math.abs(A[2 * (r * n + k) + 1]);
      if (mag > best) { best = mag; pr = r; }
    }
    if (!(best > SINGULAR_TOL * scale[k])) {
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
    const den = dr * dr + di * di;
    const ir = dr / den, ii = -di / den;
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
    const den = dr * dr + di * di;
    const ir = dr / den, ii = -di / den;
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
    for (let c = 0; c < m; c++) { zb[2 * (a * m + c)] = X[2 * (na * m + c)]; zb[2 * (a * m + c) + 1] = X[2 * (na * m + c) + 1]; }
  }
  // Z'_ac = −X_aᵀ·Y'·X_c (X columns are the full node-voltage responses, Y' symmetric).
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
      zbd[2 * (a * m + c)] = -sr; zbd[2 * (a * m + c) + 1] = -si;
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

function branchShort(ws: SweepWorkspace, f: number, part: number): EngineError {
  const freq = ws.freqs[f];
  return new EngineError(
    "SINGULAR_MATRIX",
    `nodal matrix is singular at ${freq} Hz: the series R-L-C model of part ${ws.partRefs[part]} is a short circuit there (zero impedance)`,
    { details: { freq, ref: ws.partRefs[part] } },
  );
}

function nonFinite(ws: SweepWorkspace, f: number): EngineError {
  const freq = ws.freqs[f];
  return new EngineError("SINGULAR_MATRIX", `nodal solution is not finite at ${freq} Hz (values out of floating-point range)`, {
    details: { freq },
  });
}
