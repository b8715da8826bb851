import { describe, expect, it } from "vitest";
import { prototypeValues, synthesizeLadder, type LadderSpec } from "../../../shared/engine/synthesis";
import type { Netlist } from "../../../shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../../../shared/engine/solver";
import { analyzeLadder, groupDelay, insertionLossDb } from "../../oracles/abcd-ladder";
import { expectEngineError as expectCodedError } from "../../helpers/expect-errors";

/** INVALID_INPUT with this message and path (every bad-input case of the synthesis helpers). */
const expectEngineError = (fn: () => unknown, message: RegExp, path: string) => expectCodedError(fn, "INVALID_INPUT", message, path);

const DB3 = 10 * Math.log10(2); // 3.0103 dB: half power

/** Butterworth insertion loss, Pozar 4th ed. sec. 8.3 (docs/references.md §2): 10 log10(1 + x^(2n)), x = ω/ωc. */
function ilButterworth(n: number, x: number): number {
  return 10 * Math.log10(1 + x ** (2 * n));
}

/** Chebyshev I insertion loss, Pozar 4th ed. sec. 8.3 (docs/references.md §2): 10 log10(1 + ε² Tn²(x)). */
function ilChebyshev(n: number, lar: number, x: number): number {
  const eps2 = 10 ** (lar / 10) - 1;
  const t = x <= 1 ? Math.cos(n * Math.acos(x)) : Math.cosh(n * Math.acosh(x));
  return 10 * Math.log10(1 + eps2 * t * t);
}

function expectDb(actual: readonly number[], expected: readonly number[], tol: number, label: string) {
  actual.forEach((a, i) => {
    const d = Math.abs(a - expected[i]);
    expect(d <= tol, `${label} [${i}]: actual ${a} dB, expected ${expected[i]} dB, |Δ| ${d.toExponential(2)} > ${tol}`).toBe(true);
  });
}

function expectRel(actual: number, expected: number, rtol: number, label: string) {
  const d = Math.abs(actual - expected) / Math.abs(expected);
  expect(d <= rtol, `${label}: actual ${actual}, expected ${expected}, rel ${d.toExponential(2)} > ${rtol}`).toBe(true);
}


/** S21 (complex) and group delay of S21 through the engine's own nodal solver. */
function solverS21(netlist: Netlist, freqs: number[]) {
  const compiled = compileNetlist(netlist);
  const ev = createSweepEvaluator(compiled, Float64Array.from(freqs));
  const b = ev.evaluate(nominalValues(compiled));
  const P = b.portCount;
  return freqs.map((_, f) => {
    const idx = ((f * P + 1) * P + 0) * 2; // S21: i = 1, j = 0
    return { re: b.s[idx], im: b.s[idx + 1], gd: b.gd[(f * P + 1) * P + 0] };
  });
}

const logSweep = (from: number, to: number, points: number) =>
  Array.from({ length: points }, (_, i) => from * (to / from) ** (i / (points - 1)));

function byRef(net: Netlist) {
  return Object.fromEntries(net.parts.map((p) => [p.ref, p]));
}

describe("worked element values", () => {
  it("Pozar Example 8.3: 2 GHz, 50 ohm, n=5 maximally flat, shunt-C first", () => {
    const net = synthesizeLadder({ family: "butterworth", type: "lowpass", order: 5, cutoff: 2e9, z0: 50 });
    const p = byRef(net);
    // Pozar 4th ed. Example 8.3 (docs/references.md §3 [S values, example no. M], 3 decimals): C1 = C5 = 0.984 pF, L2 = L4 = 6.438 nH, C3 = 3.183 pF
    expect(Math.abs(p.C1.value - 0.984e-12)).toBeLessThan(5e-16);
    expect(Math.abs(p.C5.value - 0.984e-12)).toBeLessThan(5e-16);
    expect(Math.abs(p.L2.value - 6.438e-9)).toBeLessThan(5e-13);
    expect(Math.abs(p.L4.value - 6.438e-9)).toBeLessThan(5e-13);
    expect(Math.abs(p.C3.value - 3.183e-12)).toBeLessThan(5e-16);
    // docs/references.md §3 [C] (tests/fixtures/generators/closed_form_values.py): 0.98358 pF, 6.43782 nH, 3.18310 pF. The first two follow from the 4-decimal table
    // g = 0.618, 1.618; with the exact g1 = 2 sin(π/10) = 0.618034 they move by 5.5e-5 relative, hence 1e-4.
    expectRel(p.C1.value, 0.98358e-12, 1e-4, "C1");
    expectRel(p.L2.value, 6.43782e-9, 1e-4, "L2");
    expectRel(p.C3.value, 3.1831e-12, 2e-6, "C3"); // g3 = 2 exactly: 1/(50·π·2e9) = 3.18310 pF
    // [C] Pozar eq. for shunt C, C = g/(R0 ωc), with the exact g1 = 2 sin(π/10), evaluated here
    expectRel(p.C1.value, (2 * Math.sin(Math.PI / 10)) / (50 * 2 * Math.PI * 2e9), 1e-12, "C1 exact");
    expect(net.parts.map((x) => x.ref)).toEqual(["C1", "L2", "C3", "L4", "C5"]);
    expect(net.parts.map((x) => x.nodes)).toEqual([
      ["n1", "gnd"],
      ["n1", "n2"],
      ["n2", "gnd"],
      ["n2", "n3"],
      ["n3", "gnd"],
    ]);
    expect(net.ports).toEqual([
      { name: "in", node: "n1", z0: 50 },
      { name: "out", node: "n3", z0: 50 },
    ]);
    expect(net.name).toBe("Butterworth low-pass, n=5, 2 GHz");
    expect(net.parts.every((x) => x.tolerance === undefined)).toBe(true);
  });

  it("3rd-order Butterworth, 50 ohm, 100 MHz: pi, T and high-pass (docs/references.md §3)", () => {
    const base = { family: "butterworth", order: 3, cutoff: 100e6, z0: 50 } as const;
    const pi = synthesizeLadder({ ...base, type: "lowpass" });
    const tee = synthesizeLadder({ ...base, type: "lowpass", first: "series" });
    const hp = synthesizeLadder({ ...base, type: "highpass" });
    // docs/references.md §3 [C] (tests/fixtures/generators/closed_form_values.py), 5 significant digits: pi 31.831 pF, 159.155 nH, 31.831 pF
    const rows: [Netlist, string[], number[]][] = [
      [pi, ["C1", "L2", "C3"], [31.831e-12, 159.155e-9, 31.831e-12]],
      // T: 79.577 nH, 63.662 pF, 79.577 nH
      [tee, ["L1", "C2", "L3"], [79.577e-9, 63.662e-12, 79.577e-9]],
      // high-pass from the pi: shunt L 79.577 nH, series C 15.915 pF, shunt L 79.577 nH
      [hp, ["L1", "C2", "L3"], [79.577e-9, 15.915e-12, 79.577e-9]],
    ];
    for (const [net, refs, values] of rows) {
      expect(net.parts.map((x) => x.ref)).toEqual(refs);
      // printed to 3 decimals in pF / nH: half a unit of the last digit
      net.parts.forEach((x, i) => {
        const unit = x.kind === "C" ? 1e-12 : 1e-9;
        expect(Math.abs(x.value - values[i]) / unit, `${net.name} ${x.ref}`).toBeLessThanOrEqual(5e-4);
      });
    }
    expect(hp.parts[0].nodes).toEqual(["n1", "gnd"]); // shunt L
    expect(tee.parts[0].nodes).toEqual(["n1", "n2"]); // series L first
    // IL(200 MHz) = 18.129 dB (docs/references.md §3 [C]; a course note quotes 18.13 dB [S]), for pi and T alike
    expectDb(insertionLossDb(pi, [200e6]), [18.129], 5e-4, "pi");
    expectDb(insertionLossDb(tee, [200e6]), [18.129], 5e-4, "T");
    expectDb(insertionLossDb(hp, [50e6]), [18.129], 5e-4, "high-pass at fc/2");
  });
});

describe("low-pass and high-pass ladders against the closed-form insertion loss", () => {
  // docs/references.md §2 [C]: Butterworth IL at ω/ωc = 1.5 / 2 / 3 (3 decimals; tests/fixtures/generators/closed_form_values.py)
  const printed: Record<number, number[]> = {
    3: [10.931, 18.129, 28.633],
    4: [14.254, 24.099, 38.17],
    5: [17.684, 30.107, 47.712],
    7: [24.668, 42.144, 66.797],
  };
  for (const [n, row] of Object.entries(printed)) {
    it(`Butterworth n=${n} at 1.5/2/3 ωc equals docs/references.md §2`, () => {
      for (const first of ["shunt", "series"] as const) {
        const lp = synthesizeLadder({ family: "butterworth", type: "lowpass", order: Number(n), cutoff: 1e9, first });
        expectDb(insertionLossDb(lp, [1.5e9, 2e9, 3e9]), row, 5e-4, `lp n=${n} ${first}`);
        const hp = synthesizeLadder({ family: "butterworth", type: "highpass", order: Number(n), cutoff: 1e9, first });
        expectDb(insertionLossDb(hp, [1e9 / 1.5, 1e9 / 2, 1e9 / 3]), row, 5e-4, `hp n=${n} ${first}`);
      }
    });
  }

  const families: { family: "butterworth" | "chebyshev"; ripple?: number }[] = [
    { family: "butterworth" },
    { family: "chebyshev", ripple: 0.1 },
    { family: "chebyshev", ripple: 0.5 },
    { family: "chebyshev", ripple: 1 },
    { family: "chebyshev", ripple: 3 },
  ];
  const fc = 150e6;
  const sweep = [...logSweep(fc / 20, fc * 5, 41), fc];
  for (const { family, ripple } of families) {
    for (const order of [1, 2, 3, 4, 5, 6, 7, 9, 12]) {
      it(`${family}${ripple ? ` ${ripple} dB` : ""} n=${order}: lp and hp, shunt- and series-first, within 1e-6 dB`, () => {
        const closed = (x: number) => (family === "butterworth" ? ilButterworth(order, x) : ilChebyshev(order, ripple as number, x));
        for (const first of ["shunt", "series"] as const) {
          const spec = { family, order, cutoff: fc, rippleDb: ripple, first, z0: 75 };
          const lp = synthesizeLadder({ ...spec, type: "lowpass" });
          const hp = synthesizeLadder({ ...spec, type: "highpass" });
          // the issue asks 0.01 dB; the transform is exact, so the check is much tighter
          expectDb(insertionLossDb(lp, sweep), sweep.map((f) => closed(f / fc)), 1e-6, `lp ${first}`);
          expectDb(insertionLossDb(hp, sweep), sweep.map((f) => closed(fc / f)), 1e-6, `hp ${first}`);
        }
      });
    }
  }

  it("even-order Chebyshev terminations: shunt-first R0/g(n+1), series-first R0·g(n+1)", () => {
    // g5 = 1.9841 for 0.5 dB n=4 (Pozar Table 8.4); 4 decimals
    const g5 = 1.9841;
    const a = synthesizeLadder({ family: "chebyshev", type: "lowpass", order: 4, cutoff: 1e9, rippleDb: 0.5 });
    const b = synthesizeLadder({ family: "chebyshev", type: "lowpass", order: 4, cutoff: 1e9, rippleDb: 0.5, first: "series" });
    expect(Math.abs(a.ports[1].z0 - 50 / g5)).toBeLessThan(50 / g5 * 1e-4);
    expect(Math.abs(b.ports[1].z0 - 50 * g5)).toBeLessThan(50 * g5 * 1e-4);
    expect(a.ports[0].z0).toBe(50);
    // IL at DC = ripple for even n (docs/references.md §1.2): the mismatch is the whole loss
    expectDb(insertionLossDb(a, [1e3]), [0.5], 1e-6, "shunt-first DC");
    expectDb(insertionLossDb(b, [1e3]), [0.5], 1e-6, "series-first DC");
  });

  it("the engine's nodal solver agrees with the ABCD oracle on synthesized ladders", () => {
    const specs: LadderSpec[] = [
      { family: "butterworth", type: "lowpass", order: 5, cutoff: 2e9 },
      { family: "chebyshev", type: "lowpass", order: 4, cutoff: 1e9, rippleDb: 0.5, first: "series" },
      { family: "chebyshev", type: "highpass", order: 7, cutoff: 1e8, rippleDb: 0.1 },
      { family: "bessel", type: "lowpass", order: 6, cutoff: 1e8 },
      { family: "butterworth", type: "bandpass", order: 4, low: 1.8e9, high: 2.2e9 },
      { family: "chebyshev", type: "bandstop", order: 3, low: 90e6, high: 110e6, rippleDb: 0.5, first: "series" },
    ];
    for (const spec of specs) {
      const net = synthesizeLadder(spec);
      const f0 = spec.cutoff ?? Math.sqrt((spec.low as number) * (spec.high as number));
      const freqs = logSweep(f0 / 7.3, f0 * 7.1, 31);
      const oracle = analyzeLadder(net, freqs).s21;
      const oracleGd = groupDelay(net, freqs);
      const engine = solverS21(net, freqs);
      freqs.forEach((f, i) => {
        const o = oracle[i];
        const e = engine[i];
        const err = Math.hypot(o.re - e.re, o.im - e.im) / Math.max(Math.hypot(o.re, o.im), 1e-12);
        expect(err, `${net.name} S21 at ${f} Hz`).toBeLessThan(1e-9);
        // group delay: oracle by central difference (~1e-8 relative); skip points deep in the stop band
        if (Math.hypot(o.re, o.im) > 1e-3) expectRel(e.gd, oracleGd[i], 1e-6, `${net.name} gd at ${f} Hz`);
      });
    }
  });
});

describe("band-pass and band-stop ladders", () => {
  const mapped = (type: "bandpass" | "bandstop", f: number, low: number, high: number) => {
    // Pozar 4th ed. sec. 8.4: ω ← (ω/ω0 − ω0/ω)/Δ (band-pass), its reciprocal for band-stop
    const f0 = Math.sqrt(low * high);
    const delta = (high - low) / f0;
    const u = Math.abs(f / f0 - f0 / f) / delta;
    return type === "bandpass" ? u : 1 / u;
  };
  const cases: { family: "butterworth" | "chebyshev"; ripple?: number; order: number }[] = [
    { family: "butterworth", order: 3 },
    { family: "butterworth", order: 4 },
    { family: "chebyshev", ripple: 0.5, order: 3 },
    { family: "chebyshev", ripple: 0.1, order: 4 },
    { family: "chebyshev", ripple: 1, order: 5 },
  ];
  for (const { family, ripple, order } of cases) {
    for (const type of ["bandpass", "bandstop"] as const) {
      it(`${family}${ripple ? ` ${ripple} dB` : ""} ${type} n=${order}: edges and low-pass-equivalent mapping`, () => {
        for (const [low, high] of [
          [1.8e9, 2.2e9],
          [100e6, 400e6],
        ]) {
          for (const first of ["shunt", "series"] as const) {
            const net = synthesizeLadder({ family, type, order, low, high, rippleDb: ripple, first });
            // edge loss: 3.0103 dB (Butterworth, Pozar sec. 8.3) or the ripple (Chebyshev ripple edge)
            const edge = family === "butterworth" ? DB3 : (ripple as number);
            expectDb(insertionLossDb(net, [low, high]), [edge, edge], 0.01, `${net.name} ${first} edges`);
            const f0 = Math.sqrt(low * high);
            const probes = [0.4 * low, 0.93 * low, 1.003 * f0, 1.04 * high, 2.5 * high];
            const closed = (x: number) => (family === "butterworth" ? ilButterworth(order, x) : ilChebyshev(order, ripple as number, x));
            const expected = probes.map((f) => closed(mapped(type, f, low, high)));
            expectDb(insertionLossDb(net, probes), expected, 1e-6, `${net.name} ${first} mapping`);
          }
        }
      });
    }
  }

  it("band-pass and band-stop structure: resonator refs share the position number", () => {
    const bp = synthesizeLadder({ family: "butterworth", type: "bandpass", order: 3, low: 1.8e9, high: 2.2e9 });
    expect(bp.parts.map((p) => [p.ref, ...p.nodes])).toEqual([
      ["L1", "n1", "gnd"],
      ["C1", "n1", "gnd"],
      ["L2", "n1", "n2"],
      ["C2", "n2", "n3"],
      ["L3", "n3", "gnd"],
      ["C3", "n3", "gnd"],
    ]);
    expect(bp.ports[1].node).toBe("n3");
    expect(bp.name).toBe("Butterworth band-pass, n=3, 1.8 GHz to 2.2 GHz");
    const bs = synthesizeLadder({ family: "chebyshev", type: "bandstop", order: 3, low: 90e6, high: 110e6, rippleDb: 0.5 });
    expect(bs.parts.map((p) => [p.ref, ...p.nodes])).toEqual([
      ["L1", "n1", "n2"],
      ["C1", "n2", "gnd"],
      ["L2", "n1", "n3"],
      ["C2", "n1", "n3"],
      ["L3", "n3", "n4"],
      ["C3", "n4", "gnd"],
    ]);
    expect(bs.ports[1].node).toBe("n3");
    expect(bs.name).toBe("Chebyshev 0.5 dB band-stop, n=3, 90 MHz to 110 MHz");
    // each resonator tunes to ω0 = √(ω1ω2) (Pozar sec. 8.4): L·C = 1/ω0²
    const w0 = 2 * Math.PI * Math.sqrt(90e6 * 110e6);
    const p = byRef(bs);
    for (const k of [1, 2, 3]) expectRel(p[`L${k}`].value * p[`C${k}`].value, 1 / (w0 * w0), 1e-12, `resonator ${k}`);
  });
});

describe("Bessel ladders", () => {
  /** Reverse Bessel polynomial from its factorial formula (Thomson 1949) and its group delay
   *  τ(ω) = (E·O′ − O·E′)/(E² + O²), B(jω) = E + jO — [C] in this test, independent of the synthesis. */
  function besselDelay(n: number, w: number): number {
    const fact = (m: number): number => (m <= 1 ? 1 : m * fact(m - 1));
    let e = 0;
    let o = 0;
    let de = 0;
    let dO = 0;
    for (let k = 0; k <= n; k++) {
      const ak = fact(2 * n - k) / (2 ** (n - k) * fact(k) * fact(n - k));
      const sign = k % 4 === 0 || k % 4 === 1 ? 1 : -1; // (j)^k = ±1 or ±j
      const v = sign * ak * w ** k;
      const dv = k === 0 ? 0 : sign * ak * k * w ** (k - 1);
      if (k % 2 === 0) {
        e += v;
        de += dv;
      } else {
        o += v;
        dO += dv;
      }
    }
    return (e * dO - o * de) / (e * e + o * o);
  }

  for (let n = 2; n <= 10; n++) {
    it(`n=${n}: −3 dB at the cutoff, DC delay = w3dB/ωc (both forms)`, () => {
      const fc = 10e6;
      const w3 = prototypeValues("bessel", n).w3dB;
      for (const first of ["shunt", "series"] as const) {
        const net = synthesizeLadder({ family: "bessel", type: "lowpass", order: n, cutoff: fc, first });
        expectDb(insertionLossDb(net, [fc]), [DB3], 1e-6, `${net.name} ${first}`);
        // delay-normalized prototype has τ(0) = 1 s at ω = 1 rad/s; scaled so its w3dB maps to 2π·fc (docs/references.md §1.3)
        const [tau] = groupDelay(net, [fc * 1e-4]);
        expectRel(tau, w3 / (2 * Math.PI * fc), 1e-6, `${net.name} ${first} DC delay`);
      }
    });
  }

  it("n=5: delay flat as the polynomial says (droop 6.6e-6 at 0.5·w3dB, 0.40 % at w3dB)", () => {
    const fc = 1e6;
    const net = synthesizeLadder({ family: "bessel", type: "lowpass", order: 5, cutoff: fc });
    const w3 = prototypeValues("bessel", 5).w3dB;
    const tau0 = w3 / (2 * Math.PI * fc);
    const fractions = [0.1, 0.25, 0.5, 0.75, 1];
    const measured = groupDelay(net, fractions.map((x) => x * fc));
    fractions.forEach((x, i) => {
      const expected = besselDelay(5, x * w3); // [C] normalized τ(ω) from the polynomial, τ(0) = 1
      expectRel(measured[i] / tau0, expected, 1e-7, `τ at ${x}·w3dB`);
    });
    // [C] besselDelay (and tests/fixtures/generators/lowpass_prototypes.py): 1 − τ(0.5·w3dB) = 6.58e-6, 1 − τ(w3dB) = 3.98e-3 — "flat within 1 %" holds easily
    expect(1 - besselDelay(5, 0.5 * w3)).toBeCloseTo(6.58e-6, 8);
    expect(1 - besselDelay(5, w3)).toBeCloseTo(3.977e-3, 6);
    for (let i = 0; i <= 10; i++) {
      const [t] = groupDelay(net, [(0.05 + (0.45 * i) / 10) * fc]);
      expect(Math.abs(t / tau0 - 1)).toBeLessThan(0.01);
    }
  });

  it("band-pass Bessel has −3 dB at both band edges", () => {
    const net = synthesizeLadder({ family: "bessel", type: "bandpass", order: 4, low: 40e6, high: 60e6 });
    expectDb(insertionLossDb(net, [40e6, 60e6]), [DB3, DB3], 1e-6, "bessel bp edges");
  });
});

describe("synthesizeLadder validation", () => {
  const lp = { family: "butterworth", type: "lowpass", order: 3, cutoff: 1e9 } as const;
  it("lowpass needs cutoff", () => {
    expectEngineError(() => synthesizeLadder({ ...lp, cutoff: undefined }), /cutoff \(Hz\) is required for a lowpass filter/, "cutoff");
  });
  it.each([0, -1, Number.NaN, Number.POSITIVE_INFINITY])("cutoff %s is rejected", (cutoff) => {
    expectEngineError(() => synthesizeLadder({ ...lp, cutoff }), /cutoff must be a finite frequency above 0 Hz/, "cutoff");
  });
  it("bandpass needs low and high, low < high", () => {
    expectEngineError(() => synthesizeLadder({ ...lp, type: "bandpass", high: 2e9 }), /low \(Hz\) is required for a bandpass/, "low");
    expectEngineError(() => synthesizeLadder({ ...lp, type: "bandstop", low: 1e9 }), /high \(Hz\) is required for a bandstop/, "high");
    expectEngineError(() => synthesizeLadder({ ...lp, type: "bandpass", low: 2e9, high: 2e9 }), /low must be below high/, "low");
    expectEngineError(() => synthesizeLadder({ ...lp, type: "bandpass", low: 1e9, high: Number.NaN }), /high must be a finite/, "high");
  });
  it("bad type, z0, first, order and ripple name their parameter", () => {
    expectEngineError(() => synthesizeLadder({ ...lp, type: "allpass" as never }), /type must be one of/, "type");
    expectEngineError(() => synthesizeLadder({ ...lp, z0: 0 }), /z0 must be a finite positive resistance/, "z0");
    expectEngineError(() => synthesizeLadder({ ...lp, first: "middle" as never }), /first must be "shunt" or "series"/, "first");
    expectEngineError(() => synthesizeLadder({ ...lp, order: 0 }), /order must be an integer/, "order");
    expectEngineError(() => synthesizeLadder({ ...lp, family: "chebyshev", rippleDb: 10 }), /rippleDb must be/, "rippleDb");
  });
});
