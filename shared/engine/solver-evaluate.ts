/**
 * Numeric hot path of the Lotwise nodal solver. Per frequency: stamp the complex nodal matrix Y(ω)
 * and its derivative Y'(ω) = dY/dω into the compiled slots, eliminate the internal nodes with a
 * static-pivot LDLᵀ (Y is complex symmetric for R/L/C networks, so L·D·Lᵀ is its LU) carrying the
 * derivative of every entry along (forward-mode differentiation of the elimination), invert the
 * remaining port-node block (the port admittance matrix Yp, terminations included), and form S and
 * group delay:
 *
 *   Z = Yp⁻¹,   Z' = −Z·Yp'·Z,   S_ij = 2·Z_ij/√(z0i·z0j) − δij,   S'_ij = 2·Z'_ij/√(z0i·z0j)
 *   gd_ij = −dφ_ij/dω = −Im(S'_ij / S_ij) = −Im(S'_ij·conj(S_ij)) / |S_ij|²   (0 when S_ij = 0)
 *
 * Derivation of S: port j driven by Vs_j behind z0j is the Norton current Vs_j/z0j into its node with
 * 1/z0j to ground (stamped into Y); then V_i = Z_ij·Vs_j/z0j and S_ij = 2·V_i/Vs_j·√(z0j/z0i) − δij.
 * Z' = −Z·Yp'·Z is dV/dω = −Y⁻¹(dY/dω)V restricted to the ports, from the same factorization.
 *
 * Frequencies are processed in blocks of {@link FREQ_BLOCK}: every op of the compiled op list runs
 * as a flat loop over the block's frequencies (complex values interleaved re/im per frequency lane),
 * so index decoding is paid once per block, not once per point.
 *
 * Two-port plans whose every elimination step has one or two neighbours (every ladder) first go
 * through {@link solveChainBlock}, a per-frequency kernel doing the same arithmetic in the same
 * order with the step pattern unrolled (≈ 1.5× faster on a 7th-order ladder, bit-identical output);
 * it hands a block back to the op-list path whenever anything is off the plain path.
 *
 * When a static pivot is small against its row's admittance scale (|d|₁ ≤ 1e-3·Σ|y|₁ — an LC
 * resonance can cancel a diagonal), that frequency is redone by dense Gaussian elimination with
 * partial pivoting (solver-dense.ts); if a pivot there is ≤ 1e-13 of its column scale the system is
 * singular and EngineError SINGULAR_MATRIX names the frequency. Why 1e-3: a pivot of relative size
 * ρ grows later entries by 1/ρ, so S carries ≈ ε/ρ and the derivative (through (1/d)' = −d'/d²)
 * ≈ ε/ρ² relative error; ρ ≥ 1e-3 keeps group delay within ≈ 2e-10 (measured: a 3.6e-4 pivot cost
 * 1e-9 in gd against the oracle). The fallback is rare: a grid point must land that close to a
 * pivot's zero crossing.
 */
import { EngineError } from "./errors";
import { PARAM_C, PARAM_G, PARAM_GAMMA, PARAM_K, PARAM_L, PARAM_R, PARAM_STRIDE } from "./models";
import type { SolverPlan } from "./solver-compile";
import { FREQ_BLOCK, STATIC_PIVOT_TOL } from "./solver-constants";
import { denseSolvePoint, invertPortBlockLane } from "./solver-dense";

/** Scratch and output storage of one evaluator, allocated once. Lane q of a block = frequency f0 + q. */
export interface SweepWorkspace {
  readonly plan: SolverPlan;
  readonly nodeNames: readonly string[];
  readonly partRefs: readonly string[];
  readonly portCount: number;
  readonly freqs: Float64Array;
  readonly omega: Float64Array;
  readonly invOmega: Float64Array;
  /** Per-trial data: part parameters (models.ts), slot sums of G, C, Γ, per-node absolute sums. */
  readonly params: Float64Array;
  readonly slotG: Float64Array;
  readonly slotC: Float64Array;
  readonly slotGam: Float64Array;
  readonly nodeSG: Float64Array;
  readonly nodeSC: Float64Array;
  readonly nodeSGam: Float64Array;
  /** 2/√(z0i z0j), P×P; 1/z0 per port. */
  readonly sFactor: Float64Array;
  readonly portG: Float64Array;
  /** Block data: slot values/derivatives [(s·B + q)·2], node scales [v·B + q], L factors [(p·B + q)·2]. */
  readonly val: Float64Array;
  readonly der: Float64Array;
  readonly scale: Float64Array;
  readonly nbL: Float64Array;
  readonly nbLd: Float64Array;
  readonly inv: Float64Array;
  readonly invd: Float64Array;
  readonly bad: Uint8Array;
  /** Port-block inverse and its derivative per lane [(q·M·M + a·M + c)·2]. */
  readonly zb: Float64Array;
  readonly zbd: Float64Array;
  /** Scratch for the general port-block inversion (M×2M complex, M×M complex). */
  readonly gj: Float64Array;
  readonly tb: Float64Array;
  /** Dense fallback storage (N×N, N×N, N×M, N complex). */
  readonly denseY: Float64Array;
  readonly denseYd: Float64Array;
  readonly denseX: Float64Array;
  readonly denseT: Float64Array;
  readonly s: Float64Array;
  readonly gd: Float64Array;
  /**
   * Elimination steps for the two-neighbour kernel ({@link solveChainBlock}), 7 entries per step:
   * pivot node (= its diagonal slot), neighbour slots u1, u2 (−1 when the pivot has one neighbour),
   * update targets (u1,u1), (u1,u2), (u2,u2) (−1 when absent), and 1 for a purely reactive pivot;
   * null when the plan does not qualify (see {@link chainSteps}).
   */
  readonly chain: Int32Array | null;
  /** Per-trial slot sums interleaved [g, c, γ] at 3·slot (the two-neighbour kernel reads one array; filled only when it runs). */
  readonly coef: Float64Array;
  /** Per-frequency scratch of the two-neighbour kernel: [Re y, Im y, Re y', Im y'] at 4·slot; node scales. */
  readonly cy: Float64Array;
  readonly cs: Float64Array;
}

/** Allocate the workspace for a plan and a frequency list (Hz, already validated). */
export function createWorkspace(plan: SolverPlan, nodeNames: readonly string[], partRefs: readonly string[], z0: Float64Array, freqs: Float64Array): SweepWorkspace {
  const n = plan.nodeCount;
  const m = plan.blockNodes.length;
  const p = z0.length;
  const nf = freqs.length;
  const B = FREQ_BLOCK;
  const omega = new Float64Array(nf);
  const invOmega = new Float64Array(nf);
  for (let f = 0; f < nf; f++) {
    omega[f] = 2 * Math.PI * freqs[f];
    // At DC there is no ideal inductor (the caller rejects it), so every Γ is 0 and 1/ω may be 0.
    invOmega[f] = omega[f] === 0 ? 0 : 1 / omega[f];
  }
  const sFactor = new Float64Array(p * p);
  const portG = new Float64Array(p);
  for (let i = 0; i < p; i++) {
    portG[i] = 1 / z0[i];
    for (let j = 0; j < p; j++) sFactor[i * p + j] = 2 / Math.sqrt(z0[i] * z0[j]);
  }
  const nb = plan.nbSlot.length;
  return {
    plan, nodeNames, partRefs, portCount: p, freqs, omega, invOmega,
    params: new Float64Array(plan.partNodeA.length * PARAM_STRIDE),
    slotG: new Float64Array(plan.slotCount), slotC: new Float64Array(plan.slotCount), slotGam: new Float64Array(plan.slotCount),
    nodeSG: new Float64Array(n), nodeSC: new Float64Array(n), nodeSGam: new Float64Array(n),
    sFactor, portG,
    val: new Float64Array(2 * plan.slotCount * B), der: new Float64Array(2 * plan.slotCount * B), scale: new Float64Array(n * B),
    nbL: new Float64Array(2 * nb * B), nbLd: new Float64Array(2 * nb * B),
    inv: new Float64Array(2 * B), invd: new Float64Array(2 * B), bad: new Uint8Array(B),
    zb: new Float64Array(2 * m * m * B), zbd: new Float64Array(2 * m * m * B),
    gj: new Float64Array(4 * m * m), tb: new Float64Array(2 * m * m),
    denseY: new Float64Array(2 * n * n), denseYd: new Float64Array(2 * n * n), denseX: new Float64Array(2 * n * m), denseT: new Float64Array(2 * n),
    s: new Float64Array(2 * nf * p * p), gd: new Float64Array(nf * p * p),
    chain: p === 2 ? chainSteps(plan) : null,
    coef: new Float64Array(3 * plan.slotCount), cy: new Float64Array(4 * plan.slotCount), cs: new Float64Array(n),
  };
}

/**
 * Step table of the two-neighbour kernel (see SweepWorkspace.chain), or null when the plan does not qualify. It qualifies when
 * there are two ports on two distinct nodes and every elimination step has one or two still-active
 * neighbours. That holds for every ladder (low-, high-, band-pass and band-stop, shunt- or
 * series-first, in any node numbering): a chain node always has the two chain neighbours left once its
 * predecessors are gone (the fill-in joins it to the port at the chain's start, which is never
 * eliminated), and the hidden node of a series resonator in a shunt arm has one.
 */
function chainSteps(plan: SolverPlan): Int32Array | null {
  if (plan.blockNodes.length !== 2) return null;
  const T = plan.pivotNode.length;
  const out = new Int32Array(7 * T);
  for (let t = 0; t < T; t++) {
    const nb = plan.nbStart[t + 1] - plan.nbStart[t];
    if (nb < 1 || nb > 2) return null;
    const p0 = plan.nbStart[t], e0 = plan.updStart[t];
    const o = 7 * t;
    out[o] = plan.pivotNode[t];
    out[o + 1] = plan.nbSlot[p0];
    out[o + 2] = nb === 2 ? plan.nbSlot[p0 + 1] : -1;
    // buildPlan lists the updates of a step as (x, y), x ≤ y: (0,0), then (0,1), (1,1) for two neighbours.
    out[o + 3] = plan.updTarget[e0];
    out[o + 4] = nb === 2 ? plan.updTarget[e0 + 1] : -1;
    out[o + 5] = nb === 2 ? plan.updTarget[e0 + 2] : -1;
    out[o + 6] = plan.pivotImag[t];
  }
  return out;
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
  if (ws.chain !== null) {
    const coef = ws.coef;
    for (let s = 0; s < slotG.length; s++) { coef[3 * s] = slotG[s]; coef[3 * s + 1] = slotC[s]; coef[3 * s + 2] = slotGam[s]; }
  }
  // The real parts of purely imaginary slots in ws.val / ws.der are written by nothing at all (not
  // the block loop, not the kernels), so they keep the zeros of the fresh Float64Array: no per-trial reset.
}

/** Solve every frequency for the stamped trial and write ws.s and ws.gd. Allocates nothing. */
export function solveSweep(ws: SweepWorkspace): void {
  const nf = ws.omega.length;
  for (let f0 = 0; f0 < nf; f0 += FREQ_BLOCK) {
    const nq = Math.min(FREQ_BLOCK, nf - f0);
    if (ws.chain === null || !solveChainBlock(ws, ws.chain, f0, nq)) solveBlock(ws, f0, nq);
  }
}

/**
 * Two-neighbour kernel: frequencies f0 ≤ f < f0 + nq of a 2-port plan whose every elimination step has
 * one or two neighbours (every ladder, see {@link chainSteps}). It exists because for such small
 * systems the op-list block loop spends most of its time on index decoding and on loads and stores
 * of its lane arrays; here one frequency at a time runs straight through with the step pattern
 * unrolled, slot values in a few-entry scratch that stays in L1, and the 2×2 port inversion and the
 * S / group-delay write fused.
 *
 * It performs exactly the floating-point operations of solveBlock, eliminateReactive,
 * invertPortBlock2 and writeSParams in the same order, so its output is bit-identical to theirs.
 * Anything off the plain path (a shorted branch, a static pivot or port determinant below its
 * threshold, a non-finite result) returns false without throwing: the caller then re-runs the whole
 * block through solveBlock, which overwrites every lane of the block with the same values, does the
 * dense fallback and raises the same errors as before, in the same order.
 */
function solveChainBlock(ws: SweepWorkspace, steps: Int32Array, f0: number, nq: number): boolean {
  const { plan, omega, invOmega, nodeSG, nodeSC, nodeSGam, params, coef, cy, cs, sFactor, s, gd } = ws;
  const { branchParts, partDiagA, partDiagB, partOff, blockSlot } = plan;
  const slotCount = plan.slotCount;
  const n = plan.nodeCount;
  const nsteps = steps.length;
  const tol = STATIC_PIVOT_TOL;
  const oa = 4 * blockSlot[0], ob = 4 * blockSlot[1], od = 4 * blockSlot[3];
  const k11 = sFactor[0], k12 = sFactor[1], k22 = sFactor[3];
  for (let f = f0; f < f0 + nq; f++) {
    const w = omega[f], iw = invOmega[f], iw2 = iw * iw;
    // Y = G + j(ωC − Γ/ω),  Y' = j(C + Γ/ω²)
    // (slotG is exactly +0 on purely imaginary slots: only zero g's are ever added there.)
    for (let sl = 0, o = 0, e = 0; sl < slotCount; sl++, o += 4, e += 3) {
      const c = coef[e + 1], gm = coef[e + 2];
      cy[o] = coef[e];
      cy[o + 1] = w * c - iw * gm;
      cy[o + 2] = 0;
      cy[o + 3] = c + iw2 * gm;
    }
    for (let v = 0; v < n; v++) cs[v] = nodeSG[v] + w * nodeSC[v] + iw * nodeSGam[v];
    // Series R-L-C branches, as in solveBlock.
    for (let b = 0; b < branchParts.length; b++) {
      const k = branchParts[b];
      const po = k * PARAM_STRIDE;
      const r = params[po + PARAM_R], l = params[po + PARAM_L], kc = params[po + PARAM_K];
      let yr: number, yi: number, ydr: number, ydi: number;
      if (w === 0 && kc > 0) {
        yr = 0; yi = 0; ydr = 0; ydi = 1 / kc;
      } else {
        const zi = w * l - kc * iw;
        const den = r * r + zi * zi;
        if (!(den > 0)) return false;
        const id = 1 / den;
        yr = r * id;
        yi = -zi * id;
        const zpi = l + kc * iw * iw; // (kc·iw)·iw: not iw2
        ydr = 2 * zpi * yr * yi;
        ydi = -zpi * (yr * yr - yi * yi);
      }
      const mag = Math.abs(yr) + Math.abs(yi);
      const da = partDiagA[k], db = partDiagB[k], off = partOff[k];
      if (da >= 0) { const o = 4 * da; cy[o] += yr; cy[o + 1] += yi; cy[o + 2] += ydr; cy[o + 3] += ydi; cs[da] += mag; }
      if (db >= 0) { const o = 4 * db; cy[o] += yr; cy[o + 1] += yi; cy[o + 2] += ydr; cy[o + 3] += ydi; cs[db] += mag; }
      if (off >= 0) { const o = 4 * off; cy[o] -= yr; cy[o + 1] -= yi; cy[o + 2] -= ydr; cy[o + 3] -= ydi; }
    }
    // Elimination: pivot d, pivot-row entries u1 (u2), updates a(x,y) −= l_x·u_y with l = u/d.
    for (let o = 0; o < nsteps; o += 7) {
      const kd = steps[o], u1 = 4 * steps[o + 1], u2 = 4 * steps[o + 2], t11 = 4 * steps[o + 3];
      const ko = 4 * kd;
      if (steps[o + 6] === 1) {
        // Purely reactive pivot (eliminateReactive): d = jb, u = jc, l = c/b real.
        const b = cy[ko + 1];
        if (!(Math.abs(b) > tol * cs[kd])) return false;
        const ib = 1 / b;
        const i1 = cy[ko + 3] * ib * ib;
        const c1 = cy[u1 + 1], cp1 = cy[u1 + 3];
        const l1 = c1 * ib, ld1 = cp1 * ib - c1 * i1;
        cy[t11 + 1] -= l1 * c1;
        cy[t11 + 3] -= ld1 * c1 + l1 * cp1;
        if (u2 >= 0) {
          const t12 = 4 * steps[o + 4], t22 = 4 * steps[o + 5];
          const c2 = cy[u2 + 1], cp2 = cy[u2 + 3];
          const l2 = c2 * ib, ld2 = cp2 * ib - c2 * i1;
          cy[t12 + 1] -= l1 * c2;
          cy[t12 + 3] -= ld1 * c2 + l1 * cp2;
          cy[t22 + 1] -= l2 * c2;
          cy[t22 + 3] -= ld2 * c2 + l2 * cp2;
        }
        continue;
      }
      const dr = cy[ko], di = cy[ko + 1];
      if (!(Math.abs(dr) + Math.abs(di) > tol * cs[kd])) return false;
      const id = 1 / (dr * dr + di * di);
      const ir = dr * id, ii = -di * id;
      const qr = ir * ir - ii * ii, qi = 2 * ir * ii;
      const dpr = cy[ko + 2], dpi = cy[ko + 3];
      const idr = dpi * qi - dpr * qr, idi = -(dpr * qi + dpi * qr);
      const a1r = cy[u1], a1i = cy[u1 + 1], a1dr = cy[u1 + 2], a1di = cy[u1 + 3];
      const l1r = a1r * ir - a1i * ii, l1i = a1r * ii + a1i * ir;
      const l1dr = a1dr * ir - a1di * ii + a1r * idr - a1i * idi;
      const l1di = a1dr * ii + a1di * ir + a1r * idi + a1i * idr;
      cy[t11] -= l1r * a1r - l1i * a1i;
      cy[t11 + 1] -= l1r * a1i + l1i * a1r;
      cy[t11 + 2] -= l1dr * a1r - l1di * a1i + l1r * a1dr - l1i * a1di;
      cy[t11 + 3] -= l1dr * a1i + l1di * a1r + l1r * a1di + l1i * a1dr;
      if (u2 >= 0) {
        const t12 = 4 * steps[o + 4], t22 = 4 * steps[o + 5];
        const a2r = cy[u2], a2i = cy[u2 + 1], a2dr = cy[u2 + 2], a2di = cy[u2 + 3];
        const l2r = a2r * ir - a2i * ii, l2i = a2r * ii + a2i * ir;
        const l2dr = a2dr * ir - a2di * ii + a2r * idr - a2i * idi;
        const l2di = a2dr * ii + a2di * ir + a2r * idi + a2i * idr;
        cy[t12] -= l1r * a2r - l1i * a2i;
        cy[t12 + 1] -= l1r * a2i + l1i * a2r;
        cy[t12 + 2] -= l1dr * a2r - l1di * a2i + l1r * a2dr - l1i * a2di;
        cy[t12 + 3] -= l1dr * a2i + l1di * a2r + l1r * a2di + l1i * a2dr;
        cy[t22] -= l2r * a2r - l2i * a2i;
        cy[t22 + 1] -= l2r * a2i + l2i * a2r;
        cy[t22 + 2] -= l2dr * a2r - l2di * a2i + l2r * a2dr - l2i * a2di;
        cy[t22 + 3] -= l2dr * a2i + l2di * a2r + l2r * a2di + l2i * a2dr;
      }
    }
    // Port block [a b; b d] (invertPortBlock2): Z = [d −b; −b a]/(ad − b²), Z' = −Z·Yp'·Z.
    const ar = cy[oa], ai = cy[oa + 1], br = cy[ob], bi = cy[ob + 1], dr = cy[od], di = cy[od + 1];
    const adr = ar * dr - ai * di, adi = ar * di + ai * dr;
    const bbr = br * br - bi * bi, bbi = 2 * br * bi;
    const detr = adr - bbr, deti = adi - bbi;
    if (!(Math.abs(detr) + Math.abs(deti) > tol * (Math.abs(adr) + Math.abs(adi) + Math.abs(bbr) + Math.abs(bbi)))) return false;
    const id = 1 / (detr * detr + deti * deti);
    const ir = detr * id, ii = -deti * id;
    const z11r = dr * ir - di * ii, z11i = dr * ii + di * ir;
    const z22r = ar * ir - ai * ii, z22i = ar * ii + ai * ir;
    const z12r = bi * ii - br * ir, z12i = -(br * ii + bi * ir);
    const par = cy[oa + 2], pai = cy[oa + 3], pbr = cy[ob + 2], pbi = cy[ob + 3], pdr = cy[od + 2], pdi = cy[od + 3];
    const t11r = par * z11r - pai * z11i + pbr * z12r - pbi * z12i, t11i = par * z11i + pai * z11r + pbr * z12i + pbi * z12r;
    const t12r = par * z12r - pai * z12i + pbr * z22r - pbi * z22i, t12i = par * z12i + pai * z12r + pbr * z22i + pbi * z22r;
    const t21r = pbr * z11r - pbi * z11i + pdr * z12r - pdi * z12i, t21i = pbr * z11i + pbi * z11r + pdr * z12i + pdi * z12r;
    const t22r = pbr * z12r - pbi * z12i + pdr * z22r - pdi * z22i, t22i = pbr * z12i + pbi * z12r + pdr * z22i + pdi * z22r;
    const d11r = z11r * t11r - z11i * t11i + z12r * t21r - z12i * t21i, d11i = z11r * t11i + z11i * t11r + z12r * t21i + z12i * t21r;
    const d12r = z11r * t12r - z11i * t12i + z12r * t22r - z12i * t22i, d12i = z11r * t12i + z11i * t12r + z12r * t22i + z12i * t22r;
    const d22r = z12r * t12r - z12i * t12i + z22r * t22r - z22i * t22i, d22i = z12r * t12i + z12i * t12r + z22r * t22i + z22i * t22r;
    // S and group delay (writeSParams): S_ij = k_ij·Z_ij − δij, S'_ij = k_ij·Z'_ij, gd = −Im(S'·conj S)/|S|².
    const s11r = k11 * z11r - 1, s11i = k11 * z11i, e11r = k11 * -d11r, e11i = k11 * -d11i;
    const s12r = k12 * z12r - 0, s12i = k12 * z12i, e12r = k12 * -d12r, e12i = k12 * -d12i;
    const s22r = k22 * z22r - 1, s22i = k22 * z22i, e22r = k22 * -d22r, e22i = k22 * -d22i;
    const m11 = s11r * s11r + s11i * s11i, m12 = s12r * s12r + s12i * s12i, m22 = s22r * s22r + s22i * s22i;
    const g11 = m11 > 1e-280 ? (e11r * s11i - e11i * s11r) / m11 : 0;
    const g12 = m12 > 1e-280 ? (e12r * s12i - e12i * s12r) / m12 : 0;
    const g22 = m22 > 1e-280 ? (e22r * s22i - e22i * s22r) / m22 : 0;
    if (!(Math.abs(s11r) + Math.abs(s11i) + Math.abs(g11) < Infinity && Math.abs(s12r) + Math.abs(s12i) + Math.abs(g12) < Infinity &&
      Math.abs(s22r) + Math.abs(s22i) + Math.abs(g22) < Infinity)) return false;
    const so = 8 * f, go = 4 * f;
    s[so] = s11r; s[so + 1] = s11i; s[so + 2] = s12r; s[so + 3] = s12i;
    s[so + 4] = s12r; s[so + 5] = s12i; s[so + 6] = s22r; s[so + 7] = s22i;
    gd[go] = g11; gd[go + 1] = g12; gd[go + 2] = g12; gd[go + 3] = g22;
  }
  return true;
}

function solveBlock(ws: SweepWorkspace, f0: number, nq: number): void {
  const { plan, omega, invOmega, slotG, slotC, slotGam, nodeSG, nodeSC, nodeSGam, val, der, scale, params, nbL, nbLd, inv, invd, bad } = ws;
  const { branchParts, partDiagA, partDiagB, partOff, pivotNode, nbStart, nbSlot, updStart, updTarget, updA, updB, pivotImag, slotReal } = plan;
  const B = FREQ_BLOCK;
  const slotCount = plan.slotCount;
  const n = plan.nodeCount;
  bad.fill(0);
  // Y = G + j(ωC − Γ/ω),  Y' = j(C + Γ/ω²)
  for (let s = 0; s < slotCount; s++) {
    const g = slotG[s], c = slotC[s], gm = slotGam[s];
    const o = 2 * s * B;
    if (!slotReal[s]) {
      for (let q = 0; q < nq; q++) {
        const iw = invOmega[f0 + q];
        val[o + 2 * q + 1] = omega[f0 + q] * c - iw * gm;
        der[o + 2 * q + 1] = c + iw * iw * gm;
      }
      continue;
    }
    for (let q = 0; q < nq; q++) {
      const iw = invOmega[f0 + q];
      val[o + 2 * q] = g;
      val[o + 2 * q + 1] = omega[f0 + q] * c - iw * gm;
      der[o + 2 * q] = 0;
      der[o + 2 * q + 1] = c + iw * iw * gm;
    }
  }
  for (let v = 0; v < n; v++) {
    const sg = nodeSG[v], sc = nodeSC[v], sgm = nodeSGam[v];
    const o = v * B;
    for (let q = 0; q < nq; q++) scale[o + q] = sg + omega[f0 + q] * sc + invOmega[f0 + q] * sgm;
  }
  // Series R-L-C branches: y = 1/z, z = r + j(ωl − k/ω), y' = −z'·y², z' = j(l + k/ω²)
  for (let b = 0; b < branchParts.length; b++) {
    const k = branchParts[b];
    const po = k * PARAM_STRIDE;
    const r = params[po + PARAM_R], l = params[po + PARAM_L], kc = params[po + PARAM_K];
    const da = partDiagA[k], db = partDiagB[k], off = partOff[k];
    for (let q = 0; q < nq; q++) {
      const w = omega[f0 + q], iw = invOmega[f0 + q];
      let yr: number, yi: number, ydr: number, ydi: number;
      if (w === 0 && kc > 0) {
        yr = 0; yi = 0; ydr = 0; ydi = 1 / kc; // series capacitor at DC: open, y ≈ jω/k
      } else {
        const zi = w * l - kc * iw;
        const den = r * r + zi * zi;
        if (!(den > 0)) throw branchShort(ws, f0 + q, k);
        const id = 1 / den;
        yr = r * id;
        yi = -zi * id;
        const zpi = l + kc * iw * iw;
        ydr = 2 * zpi * yr * yi;
        ydi = -zpi * (yr * yr - yi * yi);
      }
      const mag = Math.abs(yr) + Math.abs(yi);
      if (da >= 0) { const o = 2 * (da * B + q); val[o] += yr; val[o + 1] += yi; der[o] += ydr; der[o + 1] += ydi; scale[da * B + q] += mag; }
      if (db >= 0) { const o = 2 * (db * B + q); val[o] += yr; val[o + 1] += yi; der[o] += ydr; der[o + 1] += ydi; scale[db * B + q] += mag; }
      if (off >= 0) { const o = 2 * (off * B + q); val[o] -= yr; val[o + 1] -= yi; der[o] -= ydr; der[o + 1] -= ydi; }
    }
  }
  // Static-pivot elimination of the internal nodes, carrying derivatives. A lane whose pivot is
  // tiny is flagged and redone densely; its garbage never mixes with other lanes.
  for (let t = 0; t < pivotNode.length; t++) {
    if (pivotImag[t]) {
      eliminateReactive(ws, t, nq);
      continue;
    }
    const kd = pivotNode[t];
    const ko = 2 * kd * B;
    const so = kd * B;
    for (let q = 0; q < nq; q++) {
      const dr = val[ko + 2 * q], di = val[ko + 2 * q + 1];
      const mag = Math.abs(dr) + Math.abs(di);
      if (!(mag > STATIC_PIVOT_TOL * scale[so + q])) {
        bad[q] = 1;
        inv[2 * q] = 0; inv[2 * q + 1] = 0; invd[2 * q] = 0; invd[2 * q + 1] = 0;
        continue;
      }
      const id = 1 / (dr * dr + di * di);
      const ir = dr * id, ii = -di * id;
      // (1/d)' = −d'·(1/d)²
      const qr = ir * ir - ii * ii, qi = 2 * ir * ii;
      const dpr = der[ko + 2 * q], dpi = der[ko + 2 * q + 1];
      inv[2 * q] = ir; inv[2 * q + 1] = ii;
      invd[2 * q] = dpi * qi - dpr * qr; invd[2 * q + 1] = -(dpr * qi + dpi * qr);
    }
    const q1 = nbStart[t + 1];
    for (let p = nbStart[t]; p < q1; p++) {
      const uo = 2 * nbSlot[p] * B;
      const lo = 2 * p * B;
      for (let q = 0; q < nq; q++) {
        const ur = val[uo + 2 * q], ui = val[uo + 2 * q + 1], upr = der[uo + 2 * q], upi = der[uo + 2 * q + 1];
        const ir = inv[2 * q], ii = inv[2 * q + 1], idr = invd[2 * q], idi = invd[2 * q + 1];
        nbL[lo + 2 * q] = ur * ir - ui * ii;
        nbL[lo + 2 * q + 1] = ur * ii + ui * ir;
        nbLd[lo + 2 * q] = upr * ir - upi * ii + ur * idr - ui * idi;
        nbLd[lo + 2 * q + 1] = upr * ii + upi * ir + ur * idi + ui * idr;
      }
    }
    // a_ij −= l_i·u_j (u_j = a_kj is not a target of this step, so it is read in place)
    const e1 = updStart[t + 1];
    for (let e = updStart[t]; e < e1; e++) {
      const to = 2 * updTarget[e] * B;
      const lo = 2 * updA[e] * B;
      const uo = 2 * nbSlot[updB[e]] * B;
      for (let q = 0; q < nq; q++) {
        const lr = nbL[lo + 2 * q], li = nbL[lo + 2 * q + 1], ldr = nbLd[lo + 2 * q], ldi = nbLd[lo + 2 * q + 1];
        const ur = val[uo + 2 * q], ui = val[uo + 2 * q + 1], udr = der[uo + 2 * q], udi = der[uo + 2 * q + 1];
        val[to + 2 * q] -= lr * ur - li * ui;
        val[to + 2 * q + 1] -= lr * ui + li * ur;
        der[to + 2 * q] -= ldr * ur - ldi * ui + lr * udr - li * udi;
        der[to + 2 * q + 1] -= ldr * ui + ldi * ur + lr * udi + li * udr;
      }
    }
  }
  const m = plan.blockNodes.length;
  if (m === 2) {
    invertPortBlock2(ws, f0, nq);
  } else {
    for (let q = 0; q < nq; q++) if (!bad[q] && !invertPortBlockLane(ws, q)) bad[q] = 1;
    writeSParams(ws, f0, 0, nq, false);
  }
  for (let q = 0; q < nq; q++) {
    if (!bad[q]) continue;
    denseSolvePoint(ws, f0 + q, q);
    writeSParams(ws, f0, q, q + 1, false);
  }
}

/**
 * Elimination step t for a purely reactive pivot (see SolverPlan.pivotImag), all lanes: with
 * d = jb, u = jc (b, c, and their ω-derivatives real), l = u/d = c/b is real,
 * l' = c'/b − c·b'/b², and the update a_ij −= l_i·u_j only changes imaginary parts.
 */
function eliminateReactive(ws: SweepWorkspace, t: number, nq: number): void {
  const { plan, val, der, scale, nbL, nbLd, inv, bad } = ws;
  const { pivotNode, nbStart, nbSlot, updStart, updTarget, updA, updB } = plan;
  const B = FREQ_BLOCK;
  const kd = pivotNode[t];
  const ko = 2 * kd * B;
  const so = kd * B;
  for (let q = 0; q < nq; q++) {
    const b = val[ko + 2 * q + 1];
    if (!(Math.abs(b) > STATIC_PIVOT_TOL * scale[so + q])) {
      bad[q] = 1;
      inv[2 * q] = 0; inv[2 * q + 1] = 0;
      continue;
    }
    const ib = 1 / b;
    inv[2 * q] = ib;
    inv[2 * q + 1] = der[ko + 2 * q + 1] * ib * ib; // b'/b²
  }
  const q1 = nbStart[t + 1];
  for (let p = nbStart[t]; p < q1; p++) {
    const uo = 2 * nbSlot[p] * B + 1;
    const lo = 2 * p * B;
    for (let q = 0; q < nq; q++) {
      const c = val[uo + 2 * q], cp = der[uo + 2 * q];
      const ib = inv[2 * q];
      nbL[lo + 2 * q] = c * ib;
      nbLd[lo + 2 * q] = cp * ib - c * inv[2 * q + 1];
    }
  }
  const e1 = updStart[t + 1];
  for (let e = updStart[t]; e < e1; e++) {
    const to = 2 * updTarget[e] * B + 1;
    const lo = 2 * updA[e] * B;
    const uo = 2 * nbSlot[updB[e]] * B + 1;
    for (let q = 0; q < nq; q++) {
      const l = nbL[lo + 2 * q], ld = nbLd[lo + 2 * q];
      const c = val[uo + 2 * q], cp = der[uo + 2 * q];
      val[to + 2 * q] -= l * c;
      der[to + 2 * q] -= ld * c + l * cp;
    }
  }
}

/**
 * Two distinct port nodes, all lanes: Z = [d −b; −b a]/(ad − b²) for the symmetric block [a b; b d],
 * and Z' = −Z·Yp'·Z written out. A lane whose determinant is tiny against a·d and b² is flagged.
 */
function invertPortBlock2(ws: SweepWorkspace, f0: number, nq: number): void {
  const { plan, val, der, zb, zbd, bad } = ws;
  const B = FREQ_BLOCK;
  const bs = plan.blockSlot;
  const oa = 2 * bs[0] * B, ob = 2 * bs[1] * B, od = 2 * bs[3] * B;
  for (let q = 0; q < nq; q++) {
    const x = 2 * q;
    const ar = val[oa + x], ai = val[oa + x + 1], br = val[ob + x], bi = val[ob + x + 1], dr = val[od + x], di = val[od + x + 1];
    const adr = ar * dr - ai * di, adi = ar * di + ai * dr;
    const bbr = br * br - bi * bi, bbi = 2 * br * bi;
    const detr = adr - bbr, deti = adi - bbi;
    if (!(Math.abs(detr) + Math.abs(deti) > STATIC_PIVOT_TOL * (Math.abs(adr) + Math.abs(adi) + Math.abs(bbr) + Math.abs(bbi)))) {
      bad[q] = 1;
      continue;
    }
    const id = 1 / (detr * detr + deti * deti);
    const ir = detr * id, ii = -deti * id;
    const z11r = dr * ir - di * ii, z11i = dr * ii + di * ir;
    const z22r = ar * ir - ai * ii, z22i = ar * ii + ai * ir;
    const z12r = bi * ii - br * ir, z12i = -(br * ii + bi * ir);
    // T = Yp'·Z with Yp' = [pa pb; pb pd]
    const par = der[oa + x], pai = der[oa + x + 1], pbr = der[ob + x], pbi = der[ob + x + 1], pdr = der[od + x], pdi = der[od + x + 1];
    const t11r = par * z11r - pai * z11i + pbr * z12r - pbi * z12i, t11i = par * z11i + pai * z11r + pbr * z12i + pbi * z12r;
    const t12r = par * z12r - pai * z12i + pbr * z22r - pbi * z22i, t12i = par * z12i + pai * z12r + pbr * z22i + pbi * z22r;
    const t21r = pbr * z11r - pbi * z11i + pdr * z12r - pdi * z12i, t21i = pbr * z11i + pbi * z11r + pdr * z12i + pdi * z12r;
    const t22r = pbr * z12r - pbi * z12i + pdr * z22r - pdi * z22i, t22i = pbr * z12i + pbi * z12r + pdr * z22i + pdi * z22r;
    // Z' = −Z·T (symmetric: 11, 12, 22)
    const d11r = z11r * t11r - z11i * t11i + z12r * t21r - z12i * t21i, d11i = z11r * t11i + z11i * t11r + z12r * t21i + z12i * t21r;
    const d12r = z11r * t12r - z11i * t12i + z12r * t22r - z12i * t22i, d12i = z11r * t12i + z11i * t12r + z12r * t22i + z12i * t22r;
    const d22r = z12r * t12r - z12i * t12i + z22r * t22r - z22i * t22i, d22i = z12r * t12i + z12i * t12r + z22r * t22i + z22i * t22r;
    const o = 8 * q;
    zb[o] = z11r; zb[o + 1] = z11i; zb[o + 2] = z12r; zb[o + 3] = z12i; zb[o + 4] = z12r; zb[o + 5] = z12i; zb[o + 6] = z22r; zb[o + 7] = z22i;
    zbd[o] = -d11r; zbd[o + 1] = -d11i; zbd[o + 2] = -d12r; zbd[o + 3] = -d12i; zbd[o + 4] = -d12r; zbd[o + 5] = -d12i; zbd[o + 6] = -d22r; zbd[o + 7] = -d22i;
  }
  writeSParams(ws, f0, 0, nq, true);
}

/**
 * S_ij and gd_ij of lanes q0 ≤ q < q1 from zb/zbd, for i ≤ j, mirrored (Z is symmetric for a
 * reciprocal network). With `skipBad`, lanes flagged for the dense fallback are left for later.
 */
function writeSParams(ws: SweepWorkspace, f0: number, q0: number, q1: number, skipBad: boolean): void {
  const { plan, zb, zbd, sFactor, s, gd, bad } = ws;
  const p = ws.portCount;
  const m = plan.blockNodes.length;
  const mm = 2 * m * m;
  const portBlock = plan.portBlock;
  for (let i = 0; i < p; i++) {
    const bi = portBlock[i];
    for (let j = i; j < p; j++) {
      const zo = 2 * (bi * m + portBlock[j]);
      const kf = sFactor[i * p + j];
      const diag = i === j ? 1 : 0;
      for (let q = q0; q < q1; q++) {
        if (skipBad && bad[q]) continue;
        const o = q * mm + zo;
        const sr = kf * zb[o] - diag, si = kf * zb[o + 1];
        const dr = kf * zbd[o], di = kf * zbd[o + 1];
        const m2 = sr * sr + si * si;
        // −Im(S'·conj S)/|S|²; the phase of an exactly vanishing S_ij is undefined: report 0.
        const g = m2 > 1e-280 ? (dr * si - di * sr) / m2 : 0;
        if (!(Math.abs(sr) + Math.abs(si) + Math.abs(g) < Infinity)) throw nonFinite(ws, f0 + q);
        const f = f0 + q;
        const ij = (f * p + i) * p + j, ji = (f * p + j) * p + i;
        s[2 * ij] = sr; s[2 * ij + 1] = si; s[2 * ji] = sr; s[2 * ji + 1] = si;
        gd[ij] = g; gd[ji] = g;
      }
    }
  }
}

export function branchShort(ws: SweepWorkspace, f: number, part: number): EngineError {
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
