/**
 * Test oracle: S-parameters of a two-port ladder by series/parallel reduction and an ABCD cascade,
 * written independently of the engine's nodal solver. Use in tests only.
 *
 * Method (per frequency): every part is a complex impedance (R; jωL; 1/(jωC); ideal, parasitics
 * ignored). Parts between the same two nodes are combined in parallel, and a non-port, non-ground
 * node touched by exactly two branches is removed by combining them in series, until neither applies.
 * What remains must be a chain from port 1's node to port 2's node with branches to ground at chain
 * nodes; it is cascaded as ABCD matrices, series Z: [[1, Z], [0, 1]], shunt Y: [[1, 0], [Y, 1]]
 * (Pozar, Microwave Engineering 4th ed., Table 4.1). Power-wave S-parameters with real references
 * Z01, Z02 (Pozar Table 4.2 generalized; den = A·Z02 + B + C·Z01·Z02 + D·Z01):
 *   S21 = 2√(Z01·Z02)/den,  S11 = (A·Z02 + B − C·Z01·Z02 − D·Z01)/den.
 * Frequencies must be > 0 (a capacitor is an open circuit at DC).
 */
import type { Netlist } from "../../shared/engine/netlist";

export interface Cx {
  re: number;
  im: number;
}

export interface LadderResponse {
  freqs: number[];
  s21: Cx[];
  s11: Cx[];
}

/** S21 and S11 of a two-port ladder netlist (port order as in the netlist) at `freqs` (Hz). */
export function analyzeLadder(netlist: Netlist, freqs: readonly number[]): LadderResponse {
  if (netlist.ports.length !== 2) throw new Error("abcd oracle: exactly two ports");
  const [p1, p2] = netlist.ports;
  const s21: Cx[] = [];
  const s11: Cx[] = [];
  for (const f of freqs) {
    const abcd = cascade(netlist, 2 * Math.PI * f);
    const { a, b, c, d } = abcd;
    const z1 = p1.z0;
    const z2 = p2.z0;
    const den = add(add(scale(a, z2), b), add(scale(c, z1 * z2), scale(d, z1)));
    s21.push(div({ re: 2 * Math.sqrt(z1 * z2), im: 0 }, den));
    s11.push(div(sub(add(scale(a, z2), b), add(scale(c, z1 * z2), scale(d, z1))), den));
  }
  return { freqs: [...freqs], s21, s11 };
}

/** Insertion loss −20·log10|S21| in dB at each frequency. */
export function insertionLossDb(netlist: Netlist, freqs: readonly number[]): number[] {
  return analyzeLadder(netlist, freqs).s21.map((s) => -20 * Math.log10(Math.hypot(s.re, s.im)));
}

/**
 * Group delay −dφ21/dω (s) by a central difference of the phase of S21 over ±h·f (h = 1e-6 relative),
 * unwrapped across the pair. Accuracy ~1e-9 relative for smooth responses.
 */
export function groupDelay(netlist: Netlist, freqs: readonly number[], h = 1e-6): number[] {
  return freqs.map((f) => {
    const [lo, hi] = analyzeLadder(netlist, [f * (1 - h), f * (1 + h)]).s21;
    let dphi = Math.atan2(hi.im, hi.re) - Math.atan2(lo.im, lo.re);
    if (dphi > Math.PI) dphi -= 2 * Math.PI;
    if (dphi < -Math.PI) dphi += 2 * Math.PI;
    return -dphi / (2 * Math.PI * f * 2 * h);
  });
}

interface Branch {
  a: string;
  b: string;
  z: Cx;
}

function cascade(netlist: Netlist, w: number): { a: Cx; b: Cx; c: Cx; d: Cx } {
  const gnd = "gnd";
  const start = netlist.ports[0].node;
  const stop = netlist.ports[1].node;
  let branches: Branch[] = netlist.parts.map((p) => ({ a: p.nodes[0], b: p.nodes[1], z: impedance(p.kind, p.value, w) }));
  for (let changed = true; changed; ) {
    changed = false;
    // parallel: same unordered pair
    const merged: Branch[] = [];
    for (const br of branches) {
      const twin = merged.find((m) => (m.a === br.a && m.b === br.b) || (m.a === br.b && m.b === br.a));
      if (twin) {
        twin.z = div(mul(twin.z, br.z), add(twin.z, br.z));
        changed = true;
      } else merged.push({ ...br });
    }
    branches = merged;
    // series: inner node with exactly two branches
    const nodes = new Set(branches.flatMap((br) => [br.a, br.b]));
    for (const node of nodes) {
      if (node === gnd || node === start || node === stop) continue;
      const touching = branches.filter((br) => br.a === node || br.b === node);
      if (touching.length !== 2) continue;
      const [x, y] = touching;
      const farX = x.a === node ? x.b : x.a;
      const farY = y.a === node ? y.b : y.a;
      branches = branches.filter((br) => br !== x && br !== y);
      branches.push({ a: farX, b: farY, z: add(x.z, y.z) });
      changed = true;
      break;
    }
  }
  let m = { a: one(), b: zero(), c: zero(), d: one() };
  let node = start;
  const used = new Set<Branch>();
  for (;;) {
    for (const br of branches) {
      if (used.has(br)) continue;
      if ((br.a === node && br.b === gnd) || (br.b === node && br.a === gnd)) {
        m = times(m, { a: one(), b: zero(), c: div(one(), br.z), d: one() });
        used.add(br);
      }
    }
    if (node === stop) break;
    const next = branches.find((br) => !used.has(br) && (br.a === node || br.b === node));
    if (!next) throw new Error(`abcd oracle: chain broken at node ${node}`);
    used.add(next);
    m = times(m, { a: one(), b: next.z, c: zero(), d: one() });
    node = next.a === node ? next.b : next.a;
  }
  if (used.size !== branches.length) throw new Error("abcd oracle: netlist is not a simple ladder");
  return m;
}

function impedance(kind: string, value: number, w: number): Cx {
  if (kind === "R") return { re: value, im: 0 };
  if (kind === "L") return { re: 0, im: w * value };
  if (kind === "C") return { re: 0, im: -1 / (w * value) };
  throw new Error(`abcd oracle: unknown kind ${kind}`);
}

type M = { a: Cx; b: Cx; c: Cx; d: Cx };
function times(x: M, y: M): M {
  return {
    a: add(mul(x.a, y.a), mul(x.b, y.c)),
    b: add(mul(x.a, y.b), mul(x.b, y.d)),
    c: add(mul(x.c, y.a), mul(x.d, y.c)),
    d: add(mul(x.c, y.b), mul(x.d, y.d)),
  };
}
const one = (): Cx => ({ re: 1, im: 0 });
const zero = (): Cx => ({ re: 0, im: 0 });
const add = (x: Cx, y: Cx): Cx => ({ re: x.re + y.re, im: x.im + y.im });
const sub = (x: Cx, y: Cx): Cx => ({ re: x.re - y.re, im: x.im - y.im });
const scale = (x: Cx, k: number): Cx => ({ re: x.re * k, im: x.im * k });
const mul = (x: Cx, y: Cx): Cx => ({ re: x.re * y.re - x.im * y.im, im: x.re * y.im + x.im * y.re });
function div(x: Cx, y: Cx): Cx {
  const d = y.re * y.re + y.im * y.im;
  return { re: (x.re * y.re + x.im * y.im) / d, im: (x.im * y.re - x.re * y.im) / d };
}
