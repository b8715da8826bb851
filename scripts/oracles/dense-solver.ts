/**
 * Independent oracle for the Lotwise nodal solver: a plainly written dense complex nodal analysis.
 *
 * For every frequency it builds the full nodal admittance matrix Y (ports as Norton sources: 1/z0
 * from the port node to ground), and for each driven port j solves Y·V = I with I = Vs/z0j at the
 * port node (Vs = 1 V) by Gaussian elimination with partial pivoting. Then (power waves, real z0)
 *   S_ij = 2·V_i/Vs·√(z0j/z0i) − δij.
 * Group delay uses a second solve per port with the same matrix: Y·dV/dω = −(dY/dω)·V, so
 *   dS_ij/dω = 2·(dV_i/dω)/Vs·√(z0j/z0i),   gd_ij = −Im(S'_ij / S_ij).
 * Part admittances are written directly from their impedances (no shared code with the solver):
 *   R: 1/R;  L: 1/(R_q + jωL) + jωC_srf (R_q = 2π·at·L/Q, C_srf = 1/((2π·srf)²L));
 *   C: 1/(esr + jω·esl + 1/(jωC));  with dy/dω = −(dz/dω)/z² for each impedance.
 * It is slow (O(N³) per port per frequency) on purpose: it is meant to be obviously right. It lives outside tests/
 * because the bench times it too (scripts/bench.ts); the solver tests import it from here.
 */
import type { Netlist, Part } from "../../shared/engine/netlist";

interface Complex { re: number; im: number }
const cx = (re: number, im = 0): Complex => ({ re, im });
const add = (a: Complex, b: Complex): Complex => cx(a.re + b.re, a.im + b.im);
const sub = (a: Complex, b: Complex): Complex => cx(a.re - b.re, a.im - b.im);
const mul = (a: Complex, b: Complex): Complex => cx(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const div = (a: Complex, b: Complex): Complex => {
  const d = b.re * b.re + b.im * b.im;
  return cx((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};
const abs = (a: Complex): number => Math.hypot(a.re, a.im);
const neg = (a: Complex): Complex => cx(-a.re, -a.im);

/** Admittance of one part at angular frequency w, and its derivative d/dω. */
function partAdmittance(part: Part, value: number, w: number): { y: Complex; dy: Complex } {
  if (part.kind === "R") return { y: cx(1 / value), dy: cx(0) };
  if (part.kind === "L") {
    const rq = part.q ? (2 * Math.PI * part.q.at * value) / part.q.value : 0;
    const z = cx(rq, w * value); // R_q + jωL
    const dz = cx(0, value);
    let y = div(cx(1), z);
    let dy = neg(div(dz, mul(z, z)));
    if (part.srf !== undefined) {
      const cp = 1 / ((2 * Math.PI * part.srf) ** 2 * value);
      y = add(y, cx(0, w * cp));
      dy = add(dy, cx(0, cp));
    }
    return { y, dy };
  }
  const esr = part.esr ?? 0;
  const esl = part.esl ?? 0;
  // z = esr + jω·esl + 1/(jωC) = esr + j(ω·esl − 1/(ωC)),  dz/dω = j(esl + 1/(ω²C))
  const z = cx(esr, w * esl - 1 / (w * value));
  const dz = cx(0, esl + 1 / (w * w * value));
  return { y: div(cx(1), z), dy: neg(div(dz, mul(z, z))) };
}

/** Solve A·x = b (dense complex) by Gaussian elimination with partial pivoting; A and b are copied. */
function gaussSolve(A0: Complex[][], b0: Complex[]): Complex[] {
  const n = b0.length;
  const A = A0.map((row) => row.slice());
  const b = b0.slice();
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let r = k + 1; r < n; r++) if (abs(A[r][k]) > abs(A[p][k])) p = r;
    if (abs(A[p][k]) === 0) throw new Error(`oracle: singular nodal matrix (column ${k})`);
    [A[k], A[p]] = [A[p], A[k]];
    [b[k], b[p]] = [b[p], b[k]];
    for (let r = k + 1; r < n; r++) {
      const factor = div(A[r][k], A[k][k]);
      for (let c = k; c < n; c++) A[r][c] = sub(A[r][c], mul(factor, A[k][c]));
      b[r] = sub(b[r], mul(factor, b[k]));
    }
  }
  const x: Complex[] = new Array(n);
  for (let k = n - 1; k >= 0; k--) {
    let s = b[k];
    for (let c = k + 1; c < n; c++) s = sub(s, mul(A[k][c], x[c]));
    x[k] = div(s, A[k][k]);
  }
  return x;
}

/**
 * Dense reference sweep.
 * @param netlist - the netlist (nominal values, scaled by each part's tempco at tempC)
 * @param freqs - frequencies in Hz (> 0)
 * @param tempC - temperature in °C (default 25)
 * @param values - optional actual part values (netlist order) replacing the nominal ones
 * @returns s and gd with the SweepBuffers layout: s[((f*P+i)*P+j)*2 (+1)], gd[(f*P+i)*P+j]
 */
export function denseSweep(netlist: Netlist, freqs: Float64Array, tempC = 25, values?: Float64Array): { s: Float64Array; gd: Float64Array } {
  const nodes: string[] = [];
  const idx = (name: string): number => {
    if (name === "gnd") return -1;
    let i = nodes.indexOf(name);
    if (i < 0) i = nodes.push(name) - 1;
    return i;
  };
  const ends = netlist.parts.map((p) => [idx(p.nodes[0]), idx(p.nodes[1])]);
  const portNodes = netlist.ports.map((p) => idx(p.node));
  const n = nodes.length;
  const P = netlist.ports.length;
  const s = new Float64Array(2 * freqs.length * P * P);
  const gd = new Float64Array(freqs.length * P * P);
  for (let f = 0; f < freqs.length; f++) {
    const w = 2 * Math.PI * freqs[f];
    const Y: Complex[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => cx(0)));
    const dY: Complex[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => cx(0)));
    netlist.parts.forEach((part, k) => {
      const base = values ? values[k] : part.value;
      const value = base * (1 + (part.tempco ?? 0) * 1e-6 * (tempC - 25));
      const { y, dy } = partAdmittance(part, value, w);
      const [a, b] = ends[k];
      for (const [M, v] of [[Y, y], [dY, dy]] as const) {
        if (a >= 0) M[a][a] = add(M[a][a], v);
        if (b >= 0) M[b][b] = add(M[b][b], v);
        if (a >= 0 && b >= 0) {
          M[a][b] = sub(M[a][b], v);
          M[b][a] = sub(M[b][a], v);
        }
      }
    });
    netlist.ports.forEach((port, k) => {
      const a = portNodes[k];
      Y[a][a] = add(Y[a][a], cx(1 / port.z0));
    });
    for (let j = 0; j < P; j++) {
      const I = Array.from({ length: n }, () => cx(0));
      I[portNodes[j]] = add(I[portNodes[j]], cx(1 / netlist.ports[j].z0)); // Vs = 1 V behind z0j
      const V = gaussSolve(Y, I);
      // Y·dV/dω = −(dY/dω)·V
      const rhs = Array.from({ length: n }, (_, r) => {
        let acc = cx(0);
        for (let c = 0; c < n; c++) acc = add(acc, mul(dY[r][c], V[c]));
        return neg(acc);
      });
      const dV = gaussSolve(Y, rhs);
      for (let i = 0; i < P; i++) {
        const k = Math.sqrt(netlist.ports[j].z0 / netlist.ports[i].z0);
        const Sij = sub(mul(cx(2 * k), V[portNodes[i]]), cx(i === j ? 1 : 0));
        const dSij = mul(cx(2 * k), dV[portNodes[i]]);
        const o = (f * P + i) * P + j;
        s[2 * o] = Sij.re;
        s[2 * o + 1] = Sij.im;
        gd[o] = abs(Sij) === 0 ? 0 : -div(dSij, Sij).im;
      }
    }
  }
  return { s, gd };
}
