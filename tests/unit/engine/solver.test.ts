import fc from "fast-check";
import seedrandom from "seedrandom";
import { describe, expect, it } from "vitest";
import type { Netlist, Part } from "../../../shared/engine/netlist";
import {
  compileNetlist,
  createSweepEvaluator,
  inputImpedance,
  nominalValues,
  sParamDb,
  sParamDeg,
  type SweepBuffers,
} from "../../../shared/engine/solver";
import { denseSweep } from "../../../scripts/oracles/dense-solver";
import { expectClose, expectComplexClose } from "../../helpers/expect-close";

// ---------------------------------------------------------------------------------------------
// helpers

const sAt = (b: { s: Float64Array }, P: number, f: number, i: number, j: number) => {
  const o = 2 * ((f * P + i) * P + j);
  return { re: b.s[o], im: b.s[o + 1] };
};
const gdAt = (b: { gd: Float64Array }, P: number, f: number, i: number, j: number) => b.gd[(f * P + i) * P + j];
const abs2 = (c: { re: number; im: number }) => c.re * c.re + c.im * c.im;

function sweep(net: Netlist, freqs: number[], tempC = 25, values?: Float64Array): SweepBuffers {
  const compiled = compileNetlist(net);
  return createSweepEvaluator(compiled, Float64Array.from(freqs)).evaluate(values ?? nominalValues(compiled), tempC);
}

function twoPort(parts: Part[], z1 = 50, z2 = 50, n1 = "n1", n2 = "n2"): Netlist {
  return { ports: [{ name: "p1", node: n1, z0: z1 }, { name: "p2", node: n2, z0: z2 }], parts };
}

function logGrid(from: number, to: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => from * (to / from) ** (i / (n - 1)));
}

/**
 * Seeded random RLC network: a chain n1…nk of series parts, random shunts to ground, random bridges
 * between non-adjacent nodes, 2–4 ports (n1 and nk always; sometimes two ports on one node), random
 * parasitics and tempcos. Values are scaled so reactances are near 50 ohm around 100 MHz.
 */
function randomNetwork(seed: number, opts: { lossless?: boolean; ports?: number } = {}): Netlist {
  const rng = seedrandom(`lotwise-oracle-${seed}`);
  const u = (a: number, b: number) => a + (b - a) * rng();
  const pick = <T,>(xs: readonly T[]) => xs[Math.floor(rng() * xs.length)];
  const k = 2 + Math.floor(rng() * 5);
  const nodes = Array.from({ length: k }, (_, i) => `n${i + 1}`);
  const parts: Part[] = [];
  const kinds = opts.lossless ? (["L", "C"] as const) : (["R", "L", "C"] as const);
  const makePart = (a: string, b: string): Part => {
    const kind = pick(kinds);
    const ref = `${kind}${parts.length + 1}`;
    const value = kind === "R" ? 50 * 10 ** u(-1.5, 1.5) : kind === "L" ? 80e-9 * 10 ** u(-1, 1) : 30e-12 * 10 ** u(-1, 1);
    const part: Part = { ref, kind, nodes: [a, b], value };
    if (!opts.lossless) {
      if (kind === "L" && rng() < 0.3) part.q = { value: u(20, 100), at: 1e8 };
      if (kind === "C" && rng() < 0.3) part.esr = u(0.05, 0.5);
      if (kind === "C" && rng() < 0.3) part.esl = u(0.2e-9, 1e-9);
      if (rng() < 0.3) part.tempco = u(-1000, 1000);
    }
    if (kind === "L" && rng() < 0.3) part.srf = u(1e9, 5e9);
    return part;
  };
  for (let i = 0; i + 1 < k; i++) parts.push(makePart(nodes[i], nodes[i + 1]));
  for (const n of nodes) if (rng() < 0.6) parts.push(makePart(n, "gnd"));
  const bridges = Math.floor(rng() * 4);
  for (let b = 0; b < bridges && k > 2; b++) {
    const i = Math.floor(rng() * k);
    let j = Math.floor(rng() * k);
    if (Math.abs(i - j) < 2) j = (i + 2) % k;
    if (i !== j) parts.push(makePart(nodes[i], nodes[j]));
  }
  const portCount = opts.ports ?? 2 + Math.floor(rng() * 3);
  const portNodes = [nodes[0], nodes[k - 1]];
  while (portNodes.length < portCount) portNodes.push(rng() < 0.15 ? pick(portNodes) : pick(nodes));
  const ports = portNodes.map((node, i) => ({ name: `p${i + 1}`, node, z0: pick([25, 50, 75, 100]) }));
  return { ports, parts };
}

/**
 * Compare engine and oracle entry by entry.
 * S: |ΔS_ij| ≤ 1e-9·|S_ij| + 1e-13 (both are backward stable; the 1e-13 floor covers deep-stopband
 * entries whose last digits are rounding noise in either solver).
 * gd: the oracle's gd is analytic too (its own second solve Y·dV/dω = −Y'·V), so the comparison is
 * also 1e-9, but normwise: |Δgd_ij| ≤ 1e-9·(|gd_ij| + T)·max(1, 1e-3/|S_ij|), T = the largest |gd| at
 * that frequency. Normwise because a delay passing through 0 has no relative accuracy; the
 * 1e-3/|S| factor because gd = −Im(S'/S) turns an absolute error δ in S into δ/|S| (the phase of a
 * nearly vanishing S_ij is ill-conditioned in any solver). Stress run over 4000 seeds [C]: worst
 * |ΔS|/tol = 0.61, worst |Δgd|/tol = 0.73 (measured with this comparison itself, Lotwise's solver against the
 * oracle on more seeds; no outside library, so no generator script).
 */
function compareWithOracle(net: Netlist, freqs: number[], tempC: number, values?: Float64Array): void {
  const P = net.ports.length;
  const got = sweep(net, freqs, tempC, values);
  const ref = denseSweep(net, Float64Array.from(freqs), tempC, values);
  for (let f = 0; f < freqs.length; f++) {
    let T = 0;
    for (let x = 0; x < P * P; x++) T = Math.max(T, Math.abs(ref.gd[f * P * P + x]));
    for (let i = 0; i < P; i++) {
      for (let j = 0; j < P; j++) {
        const e = sAt(ref, P, f, i, j);
        const label = `S${i + 1}${j + 1} at ${freqs[f]} Hz`;
        expectComplexClose(sAt(got, P, f, i, j), e, { rtol: 1e-9, atol: 1e-13, label, input: net });
        const g = gdAt(ref, P, f, i, j);
        const mag = Math.sqrt(abs2(e));
        const tol = 1e-9 * (Math.abs(g) + T) * Math.max(1, 1e-3 / mag);
        expectClose(gdAt(got, P, f, i, j), g, { rtol: 0, atol: tol, label: `gd of ${label}`, input: net });
      }
    }
  }
}

// ---------------------------------------------------------------------------------------------

describe("closed-form two-ports", () => {
  it("series R between two 50 ohm ports: S21 = 2·50/(100 + R), S11 = R/(100 + R), gd = 0", () => {
    // Derivation: Vs behind 50 ohm drives R in series with the 50 ohm load, so V2 = Vs·50/(100 + R) and
    // S21 = 2·V2/Vs·√(50/50) = 100/(100 + R); Zin = R + 50 gives S11 = (Zin − 50)/(Zin + 50) = R/(R + 100).
    // atol 1e-13: a small R makes the nodal matrix ill-conditioned (cond ≈ 100/R), so S = 2Z/z0 − 1 carries
    // an absolute rounding error of about ε·100/R (2e-14 at R = 0.1); relative accuracy holds otherwise.
    for (const R of [0.1, 10, 50, 1e3, 1e6]) {
      const b = sweep(twoPort([{ ref: "R1", kind: "R", nodes: ["n1", "n2"], value: R }]), [1e3, 1e8]);
      for (let f = 0; f < 2; f++) {
        expectComplexClose(sAt(b, 2, f, 1, 0), { re: 100 / (100 + R), im: 0 }, { rtol: 1e-13, atol: 1e-13, label: `S21, R=${R}` });
        expectComplexClose(sAt(b, 2, f, 0, 0), { re: R / (100 + R), im: 0 }, { rtol: 1e-13, atol: 1e-13, label: `S11, R=${R}` });
        expect(Math.abs(gdAt(b, 2, f, 1, 0))).toBe(0);
      }
    }
  });

  it("shunt C between 50 ohm ports: |S21|² = 1/(1 + (ωCR/2)²), gd21 = (CR/2)/(1 + (ωCR/2)²)", () => {
    // Derivation: the load R = 50 in parallel with C gives Zp = R/(1 + jωCR); V2/Vs = Zp/(R + Zp) =
    // 1/(2 + jωCR), so S21 = 2·V2/Vs = 1/(1 + jωCR/2). Phase −atan(ωCR/2), so −dφ/dω = (CR/2)/(1 + (ωCR/2)²).
    const C = 10e-12, R = 50;
    const fc = 1 / (Math.PI * C * R); // corner where ωCR/2 = 1 (|S21|² = 1/2)
    const freqs = [fc / 100, fc / 3, fc, 3 * fc, 100 * fc];
    const b = sweep(twoPort([{ ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: C }], 50, 50, "n1", "n1"), freqs);
    freqs.forEach((f, k) => {
      const x = (2 * Math.PI * f * C * R) / 2;
      expectClose(abs2(sAt(b, 2, k, 1, 0)), 1 / (1 + x * x), { rtol: 1e-13, label: `|S21|² at ${f}` });
      expectClose(gdAt(b, 2, k, 1, 0), (C * R) / 2 / (1 + x * x), { rtol: 1e-12, label: `gd21 at ${f}` });
    });
    expectClose(sParamDb(b, 1, 0)[2], 10 * Math.log10(0.5), { rtol: 1e-12, label: "S21 dB at the corner" }); // −3.0103 dB
    expectClose(sParamDeg(b, 1, 0)[2], -45, { rtol: 1e-12, label: "S21 phase at the corner" }); // −atan(1)
  });

  it("near-wire between 50 and 200 ohm ports: S11 = (200−50)/(200+50), |S21|² = 1 − |S11|²", () => {
    // Power waves with real z0: Zin = 200 + R, S11 = (Zin − 50)/(Zin + 50); V2 = Vs·200/(250 + R),
    // S21 = 2·V2/Vs·√(50/200). With R → 0 these are 0.6 and 0.8 and the network is lossless.
    // R = 1 mΩ: a near-short makes Y ill-conditioned (cond ≈ 200/R = 2e5), so the exact formulas are
    // met to about ε·cond²-ish ≈ 1e-10 absolute; the 0.6/0.8 limits to 1e-5 (R dissipates ≈ 3.2e-6).
    const R = 1e-3;
    const b = sweep(twoPort([{ ref: "R1", kind: "R", nodes: ["n1", "n2"], value: R }], 50, 200), [1e6]);
    expectComplexClose(sAt(b, 2, 0, 0, 0), { re: (150 + R) / (250 + R), im: 0 }, { atol: 1e-10, label: "S11" });
    expectComplexClose(sAt(b, 2, 0, 1, 0), { re: ((2 * 200) / (250 + R)) * Math.sqrt(50 / 200), im: 0 }, { atol: 1e-10, label: "S21" });
    expectComplexClose(sAt(b, 2, 0, 1, 1), { re: (50 + R - 200) / (50 + R + 200), im: 0 }, { atol: 1e-10, label: "S22" });
    expectClose(sAt(b, 2, 0, 0, 0).re, 0.6, { rtol: 1e-5, label: "S11 ≈ (200−50)/(200+50)" });
    expectClose(abs2(sAt(b, 2, 0, 1, 0)), 1 - abs2(sAt(b, 2, 0, 0, 0)), { rtol: 1e-5, label: "|S21|² = 1 − |S11|²" });
    expectClose(abs2(sAt(b, 2, 0, 1, 0)), 0.64, { rtol: 1e-5, label: "|S21|² ≈ 0.64" });
    const zin = inputImpedance(b, 0, 50);
    expectClose(zin.re[0], 200 + R, { rtol: 1e-9, label: "Zin at port 1" });
    expectClose(zin.im[0], 0, { atol: 1e-9, label: "Im Zin" });
  });

  it("7th-order Butterworth low-pass matches IL = 10·log10(1 + (ω/ωc)^14) (docs/references.md §2)", () => {
    // Prototype g_k = 2·sin((2k − 1)π/(2n)) (Butterworth, equal terminations; Pozar 4th ed. sec. 8.3),
    // shunt C first, scaled to 50 ohm and fc = 100 MHz (docs/references.md §3 table).
    const n = 7, fc = 1e8, R0 = 50, wc = 2 * Math.PI * fc;
    const parts: Part[] = [];
    let node = 1;
    for (let k = 1; k <= n; k++) {
      const g = 2 * Math.sin(((2 * k - 1) * Math.PI) / (2 * n));
      if (k % 2 === 1) parts.push({ ref: `C${k}`, kind: "C", nodes: [`n${node}`, "gnd"], value: g / (R0 * wc) });
      else parts.push({ ref: `L${k}`, kind: "L", nodes: [`n${node}`, `n${++node}`], value: (R0 * g) / wc });
    }
    const b = sweep(twoPort(parts, 50, 50, "n1", `n${node}`), [1.5 * fc, 2 * fc, 3 * fc]);
    const il = sParamDb(b, 1, 0).map((x) => -x);
    // docs/references.md §2 [C] (tests/fixtures/generators/closed_form_values.py): n = 7 IL at ω/ωc = 1.5 / 2 / 3 = 24.668 / 42.144 / 66.797 dB (3 decimals printed)
    expectClose(il[0], 24.668, { atol: 6e-4, label: "IL at 1.5 fc" });
    expectClose(il[1], 42.144, { atol: 6e-4, label: "IL at 2 fc" });
    expectClose(il[2], 66.797, { atol: 6e-4, label: "IL at 3 fc" });
  });

  it("parasitics and tempco: series Z between 50 ohm ports gives S21 = 100/(100 + Z)", () => {
    // Series impedance Z between two 50 ohm ports: S21 = 2·50/(100 + Z) (as for the series R above).
    const f = 3e8, w = 2 * Math.PI * f;
    const L = 50e-9, Q = 40, at = 1e8, srf = 1.2e9;
    const C = 5e-12, esr = 0.3, esl = 0.8e-9;
    const cases: Array<[Part, { re: number; im: number }, number]> = [];
    // Inductor with Q: Z = 2π·at·L/Q + jωL
    cases.push([{ ref: "L1", kind: "L", nodes: ["n1", "n2"], value: L, q: { value: Q, at } }, { re: (2 * Math.PI * at * L) / Q, im: w * L }, 25]);
    // Inductor with srf: Z = jωL ∥ 1/(jωCp), Cp = 1/((2π srf)² L) → Z = jωL/(1 − (f/srf)²)
    cases.push([{ ref: "L1", kind: "L", nodes: ["n1", "n2"], value: L, srf }, { re: 0, im: (w * L) / (1 - (f / srf) ** 2) }, 25]);
    // Capacitor with ESR and ESL: Z = esr + j(ω·esl − 1/(ωC))
    cases.push([{ ref: "C1", kind: "C", nodes: ["n1", "n2"], value: C, esr, esl }, { re: esr, im: w * esl - 1 / (w * C) }, 25]);
    // Resistor with tempco 2000 ppm/°C at 125 °C: R(T) = R·(1 + 2000e-6·100) = 1.2·R
    cases.push([{ ref: "R1", kind: "R", nodes: ["n1", "n2"], value: 30, tempco: 2000 }, { re: 36, im: 0 }, 125]);
    for (const [part, z, tempC] of cases) {
      const b = sweep(twoPort([part]), [f], tempC);
      const den = { re: 100 + z.re, im: z.im };
      const d2 = abs2(den);
      expectComplexClose(sAt(b, 2, 0, 1, 0), { re: (100 * den.re) / d2, im: (-100 * den.im) / d2 }, { rtol: 1e-13, label: `S21 of ${JSON.stringify(part)}` });
    }
  });
});

describe("compiled solver against the dense oracle (tests/oracles/dense-solver.ts)", () => {
  const freqs = logGrid(1e6, 3e9, 13);

  it("agrees on 200 seeded random RLC networks (ladders and bridged, 2–4 ports, parasitics, tempco)", () => {
    let multiPort = 0;
    let sharedNode = 0;
    for (let seed = 0; seed < 200; seed++) {
      const net = randomNetwork(seed);
      if (net.ports.length > 2) multiPort++;
      if (new Set(net.ports.map((p) => p.node)).size < net.ports.length) sharedNode++;
      compareWithOracle(net, freqs, seed % 3 === 0 ? 85 : 25);
    }
    // the generator really produced the cases the test claims to cover
    expect(multiPort).toBeGreaterThan(50);
    expect(sharedNode).toBeGreaterThan(3);
  });

  it("agrees on 60 seeded lossless LC networks (the real-arithmetic reactive-pivot path)", () => {
    let reactiveSteps = 0;
    for (let seed = 1000; seed < 1060; seed++) {
      const net = randomNetwork(seed, { lossless: true });
      reactiveSteps += compileNetlist(net).plan.pivotImag.reduce((a, b) => a + b, 0);
      compareWithOracle(net, freqs, 25);
    }
    expect(reactiveSteps).toBeGreaterThan(30); // the special path really ran
  });

  it("agrees with actual (perturbed) part values passed to evaluate", () => {
    for (let seed = 300; seed < 320; seed++) {
      const net = randomNetwork(seed);
      const rng = seedrandom(`values-${seed}`);
      const values = Float64Array.from(net.parts, (p) => p.value * (1 + 0.1 * (rng() - 0.5)));
      compareWithOracle(net, freqs, 25, values);
    }
  });

  it("agrees at a frequency where a static pivot vanishes (dense fallback path)", () => {
    // Internal node n2 between L1 and L2 with C3 to ground: its diagonal j(ωC − (1/L1 + 1/L2)/ω) is
    // exactly the first pivot and vanishes at ω² = (1/L1 + 1/L2)/C; the solve must fall back, not blow up.
    const L1 = 40e-9, L2 = 60e-9, C = 20e-12;
    const net = twoPort(
      [
        { ref: "L1", kind: "L", nodes: ["n1", "n2"], value: L1 },
        { ref: "L2", kind: "L", nodes: ["n2", "n3"], value: L2 },
        { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: C },
      ],
      50, 50, "n1", "n3",
    );
    const f0 = Math.sqrt((1 / L1 + 1 / L2) / C) / (2 * Math.PI);
    compareWithOracle(net, [f0 * 0.999, f0, f0 * 1.001], 25);
  });

  it("the oracle's analytic group delay matches central differences of its own phase", () => {
    // Validates the oracle itself: gd ≈ −[φ(ω+h) − φ(ω−h)]/(2h) with h = 1e-5·ω; truncation error
    // O(h²) ≈ 1e-10 relative, rounding ≈ 1e-16/1e-5 = 1e-11 of the phase: compare at 1e-6 relative.
    for (let seed = 0; seed < 10; seed++) {
      const net = randomNetwork(seed, { ports: 2 });
      const f = 2.3e8, rel = 1e-5;
      const ref = denseSweep(net, Float64Array.from([f * (1 - rel), f, f * (1 + rel)]));
      for (let i = 0; i < 2; i++) {
        for (let j = 0; j < 2; j++) {
          const lo = sAt(ref, 2, 0, i, j), hi = sAt(ref, 2, 2, i, j);
          // arg(hi/lo) avoids unwrapping
          const dphi = Math.atan2(hi.im * lo.re - hi.re * lo.im, hi.re * lo.re + hi.im * lo.im);
          const gdFd = -dphi / (2 * Math.PI * f * 2 * rel);
          const scale = Math.max(...[0, 1, 2, 3].map((x) => Math.abs(ref.gd[4 + x])));
          expectClose(gdAt(ref, 2, 1, i, j), gdFd, { rtol: 1e-6, atol: 1e-6 * scale, label: `oracle gd S${i + 1}${j + 1}`, input: net });
        }
      }
    }
  });
});

describe("physical properties (fast-check)", () => {
  const freqs = logGrid(1e6, 3e9, 9);
  const runs = { numRuns: 60, seed: 20261201 };

  // The engine writes S_ij and S_ji from one solve (reciprocity is built in), so only the oracle, which solves each
  // column separately, can show it; the engine then agrees with the oracle entry by entry in the tests above.
  it("reciprocity S_ij = S_ji in the independent oracle, and the engine's S_ij against it", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1_000_000 }), (seed) => {
        const net = randomNetwork(seed);
        const P = net.ports.length;
        const got = sweep(net, freqs);
        const ref = denseSweep(net, Float64Array.from(freqs));
        for (let f = 0; f < freqs.length; f++) {
          for (let i = 0; i < P; i++) {
            for (let j = i + 1; j < P; j++) {
              // The oracle solves each column separately, so its symmetry is a real check of the stamps; the engine's
              // S_ij is then held against the oracle's separately solved S_ji.
              expectComplexClose(sAt(ref, P, f, i, j), sAt(ref, P, f, j, i), { rtol: 1e-9, atol: 1e-13, label: "oracle Sij = Sji" });
              expectComplexClose(sAt(got, P, f, i, j), sAt(ref, P, f, j, i), { rtol: 1e-9, atol: 1e-13, label: "engine Sij = oracle Sji" });
            }
          }
        }
      }),
      runs,
    );
  });

  it("lossless LC two-ports conserve power: |S11|² + |S21|² = 1 (1e-9)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1_000_000 }), (seed) => {
        const net = randomNetwork(seed, { lossless: true, ports: 2 });
        const got = sweep(net, freqs);
        for (let f = 0; f < freqs.length; f++) {
          for (const j of [0, 1]) {
            const sum = abs2(sAt(got, 2, f, 0, j)) + abs2(sAt(got, 2, f, 1, j));
            expectClose(sum, 1, { atol: 1e-9, label: `column ${j + 1} power at ${freqs[f]} Hz`, input: net });
          }
        }
      }),
      runs,
    );
  });

  it("lossy RLC networks never create power: Σ_i |S_ij|² ≤ 1 for every driven port j", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1_000_000 }), (seed) => {
        const net = randomNetwork(seed);
        const P = net.ports.length;
        const got = sweep(net, freqs);
        for (let f = 0; f < freqs.length; f++) {
          for (let j = 0; j < P; j++) {
            let sum = 0;
            for (let i = 0; i < P; i++) sum += abs2(sAt(got, P, f, i, j));
            expect(sum).toBeLessThanOrEqual(1 + 1e-12);
          }
        }
      }),
      runs,
    );
  });
});

describe("evaluator contract", () => {
  const net = randomNetwork(7, { ports: 3 });
  const compiled = compileNetlist(net);
  const ev = createSweepEvaluator(compiled, Float64Array.from([1e7, 1e8, 1e9]));

  it("reuses its buffers (no per-call output allocation) and writes the documented layout", () => {
    const a = ev.evaluate(nominalValues(compiled));
    const b = ev.evaluate(nominalValues(compiled));
    expect(a).toBe(b);
    expect(a.s.length).toBe(2 * 3 * 3 * 3);
    expect(a.gd.length).toBe(3 * 3 * 3);
    expect(a.freqs).toEqual(Float64Array.from([1e7, 1e8, 1e9]));
  });

  it("rejects a wrong number of values, non-positive values and bad frequencies", () => {
    expect(() => ev.evaluate(new Float64Array(compiled.partCount + 1))).toThrow(/must hold \d+ part values/);
    const bad = nominalValues(compiled);
    bad[0] = -1;
    expect(() => ev.evaluate(bad)).toThrow(/actual value must be finite and > 0/);
    expect(() => createSweepEvaluator(compiled, Float64Array.from([1e6, Number.NaN]))).toThrow(/freqs\[1\]/);
    expect(() => sParamDb(ev.buffers, 3, 0)).toThrow(/port index 0..2/);
  });
});
