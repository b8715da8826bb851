import { describe, expect, it } from "vitest";
import { findBracketedRoot } from "../../../shared/engine/synthesis/darlington";
import { findPolynomialRoots } from "../../../shared/engine/synthesis/polynomial";
import { prototypeValues, synthesizeLadder } from "../../../shared/engine/synthesis";
import { analyzeLadder, groupDelay } from "../../oracles/abcd-ladder";
import { expectEngineError } from "../../helpers/expect-errors";

/** |actual − expected| ≤ tol for every entry, with a readable failure. */
function expectRow(actual: readonly number[], expected: readonly number[], tol: number, label: string) {
  expect(actual.length, `${label}: length`).toBe(expected.length);
  actual.forEach((a, i) => {
    const d = Math.abs(a - expected[i]);
    expect(d <= tol, `${label} g${i + 1}: actual ${a}, expected ${expected[i]}, |Δ| ${d.toExponential(2)} > tol ${tol}`).toBe(true);
  });
}


describe("Butterworth prototype", () => {
  // Pozar, Microwave Engineering 4th ed. (2011) Table 8.3 (as in docs/references.md §1.1), printed to 4 decimals.
  // n = 6 g3 = g4: exact 1.93185, printed 1.9318 or 1.9319 by different copies; both within 6e-5.
  const table: Record<number, number[]> = {
    1: [2.0],
    2: [1.4142, 1.4142],
    3: [1.0, 2.0, 1.0],
    4: [0.7654, 1.8478, 1.8478, 0.7654],
    5: [0.618, 1.618, 2.0, 1.618, 0.618],
    6: [0.5176, 1.4142, 1.9319, 1.9319, 1.4142, 0.5176],
    7: [0.445, 1.247, 1.8019, 2.0, 1.8019, 1.247, 0.445],
  };
  for (const [n, row] of Object.entries(table)) {
    it(`n=${n} matches Pozar Table 8.3`, () => {
      const p = prototypeValues("butterworth", Number(n));
      expectRow(p.g, row, 6e-5, `butterworth n=${n}`);
      expect(p.load).toBe(1); // Pozar Table 8.3: g(n+1) = 1
      expect(p.w3dB).toBe(1); // Pozar sec. 8.3: 3 dB at ω = ωc
    });
  }
});

describe("Chebyshev prototype", () => {
  // Regenerated with the other [C] numbers of this file by tests/fixtures/generators/lowpass_prototypes.py.
  // docs/references.md §1.2 table [C] (0.1 dB rows match MYJ Table 4.05-2, table no. [M]; 0.5 dB rows match Pozar Table 8.4
  // [S, published copies]).
  // Tolerance 5e-4 against printed tables (docs/references.md §1.2 lists known printed differences).
  const rows: [number, number, number[], number][] = [
    [0.1, 1, [0.3052], 1.0],
    [0.1, 2, [0.843, 0.622], 1.3554],
    [0.1, 3, [1.0316, 1.1474, 1.0316], 1.0],
    [0.1, 4, [1.1088, 1.3062, 1.7704, 0.8181], 1.3554],
    [0.1, 5, [1.1468, 1.3712, 1.975, 1.3712, 1.1468], 1.0],
    [0.1, 6, [1.1681, 1.404, 2.0562, 1.5171, 1.9029, 0.8618], 1.3554],
    [0.1, 7, [1.1812, 1.4228, 2.0967, 1.5734, 2.0967, 1.4228, 1.1812], 1.0],
    [0.5, 1, [0.6986], 1.0],
    [0.5, 2, [1.4029, 0.7071], 1.9841],
    [0.5, 3, [1.5963, 1.0967, 1.5963], 1.0],
    [0.5, 4, [1.6703, 1.1926, 2.3661, 0.8419], 1.9841],
    [0.5, 5, [1.7058, 1.2296, 2.5408, 1.2296, 1.7058], 1.0],
    [0.5, 6, [1.7254, 1.2479, 2.6064, 1.3137, 2.4758, 0.8696], 1.9841],
    // Pozar prints 1.7372 1.2583 2.6381 1.3444 here; docs/references.md §1.2 gives the exact row used below.
    [0.5, 7, [1.7373, 1.2582, 2.6383, 1.3443, 2.6383, 1.2582, 1.7373], 1.0],
    // 3 dB ripple, Pozar Table 8.4 (docs/references.md §1.2 [S])
    [3, 3, [3.3487, 0.7117, 3.3487], 1.0],
    // n=5 g3: printed 4.5381, recursion with 40/ln 10 gives 4.53755 ([C]; with 17.37, 4.53778). With the
    // printed row the ABCD oracle gives a 3.0008 dB passband peak and 2.9980 dB at ωc, with the exact row
    // 3.0000 dB at both ([C] ABCD analysis over 2001 points, tests/fixtures/generators/lowpass_prototypes.py): the
    // print is off by 5.5e-4, so 6e-4 here.
    [3, 5, [3.4817, 0.7618, 4.5381, 0.7618, 3.4817], 1.0],
  ];
  for (const [lar, n, row, load] of rows) {
    it(`${lar} dB n=${n} matches the printed table`, () => {
      const p = prototypeValues("chebyshev", n, lar);
      expectRow(p.g, row, lar === 3 && n === 5 ? 6e-4 : 5e-4, `chebyshev ${lar} dB n=${n}`);
      expect(Math.abs(p.load - load)).toBeLessThan(5e-4);
    });
  }

  it("0.5 dB n=7 equals the exact (not the printed) row", () => {
    // docs/references.md §1.2 [C] exact 1.73729 1.25824 2.63829 1.34433 (5 decimals)
    expectRow(prototypeValues("chebyshev", 7, 0.5).g.slice(0, 4), [1.73729, 1.25824, 2.63829, 1.34433], 6e-6, "0.5 dB n=7");
  });

  it("even-order load uses 40/ln 10, not 17.37", () => {
    // docs/references.md §1.2 [C]: exact 1 dB even-n g(n+1) = 2.65972 (printed 2.6599 with 17.37), 0.01 dB 1.10075
    expect(Math.abs(prototypeValues("chebyshev", 4, 1).load - 2.65972)).toBeLessThan(6e-6);
    expect(Math.abs(prototypeValues("chebyshev", 6, 0.01).load - 1.10075)).toBeLessThan(6e-6);
  });

  it("w3dB = cosh(acosh(1/ε)/n) is where the closed-form loss is 3.0103 dB", () => {
    for (const [n, lar] of [[3, 0.5], [5, 0.1], [4, 1]] as const) {
      const w = prototypeValues("chebyshev", n, lar).w3dB;
      const eps2 = 10 ** (lar / 10) - 1;
      const t = Math.cosh(n * Math.acosh(w)); // Chebyshev polynomial Tn(w), w > 1
      // Pozar sec. 8.3: IL = 10 log10(1 + ε² Tn²); 10·log10(2) = 3.0103 dB
      expect(10 * Math.log10(1 + eps2 * t * t)).toBeCloseTo(10 * Math.log10(2), 10);
    }
  });
});

describe("Bessel prototype (Darlington synthesis)", () => {
  // docs/references.md §1.3 table (a) [C] Darlington synthesis; MYJ Table 4.07-1 / Pozar Table 8.5, table nos. [M].
  // Delay-normalized, 4 decimals.
  const table: Record<number, { g: number[]; w3dB: number }> = {
    2: { g: [1.5774, 0.4226], w3dB: 1.3617 },
    3: { g: [1.255, 0.5528, 0.1922], w3dB: 1.7557 },
    4: { g: [1.0598, 0.5116, 0.3181, 0.1104], w3dB: 2.1139 },
    5: { g: [0.9303, 0.4577, 0.3312, 0.209, 0.0718], w3dB: 2.4274 },
    6: { g: [0.8377, 0.4116, 0.3158, 0.2364, 0.148, 0.0505], w3dB: 2.7034 },
    7: { g: [0.7677, 0.3744, 0.2944, 0.2378, 0.1778, 0.1104, 0.0375], w3dB: 2.9517 },
  };
  for (const [n, row] of Object.entries(table)) {
    it(`n=${n} matches docs/references.md §1.3 table (a) and its w3dB`, () => {
      const p = prototypeValues("bessel", Number(n));
      expectRow(p.g, row.g, 5e-5, `bessel n=${n}`); // docs/references.md §1.3 [C]; 5e-5 = half a unit of the 4th decimal
      expect(Math.abs(p.w3dB - row.w3dB)).toBeLessThan(5e-5);
      expect(p.load).toBe(1);
    });
  }

  it("n=1 is a single 2 F capacitor with w3dB = 1", () => {
    // [C] by hand: B(s) = s + 1; shunt C across 1 ohm ∥ 1 ohm has its pole at 1/(0.5·C) = 1 rad/s for C = 2
    const p = prototypeValues("bessel", 1);
    expectRow(p.g, [2], 1e-14, "bessel n=1");
    expect(p.w3dB).toBeCloseTo(1, 14);
  });

  // Independent check up to n = 12: the synthesized 1-ohm ladder (unscaled: cutoff such that ω = 1 rad/s
  // is the prototype's ω = 1) must give |S21|² = B(0)²/|B(jω)|² with B the reverse Bessel polynomial
  // written here from its factorial formula, and group delay 1 s at DC.
  for (let n = 2; n <= 12; n++) {
    it(`n=${n}: ladder response equals B(0)/B(s) to 1e-9 and DC delay is 1 s`, () => {
      const p = prototypeValues("bessel", n);
      const netlist = oneOhmLadder(p.g);
      const omegas = [0.05, 0.3, 1, 2, p.w3dB, 5, 9];
      const res = analyzeLadder(netlist, omegas.map((w) => w / (2 * Math.PI)));
      const a = besselByFactorials(n);
      omegas.forEach((w, i) => {
        const s = res.s21[i];
        const expected = (a[0] * a[0]) / abs2Poly(a, w); // [C] polynomial evaluated directly
        const actual = s.re * s.re + s.im * s.im;
        expect(Math.abs(actual / expected - 1), `n=${n} ω=${w}`).toBeLessThan(1e-9);
      });
      // [C] delay-normalized: τ(0) = a1/a0 = 1 s; 1e-5 allows for the finite difference at ω = 1e-3
      const [tau] = groupDelay(netlist, [1e-3 / (2 * Math.PI)]);
      expect(Math.abs(tau - 1)).toBeLessThan(1e-5);
      // −3 dB at w3dB: |S21|² = 1/2 [C]
      const s3 = res.s21[4];
      expect(s3.re * s3.re + s3.im * s3.im).toBeCloseTo(0.5, 12);
    });
  }
});

describe("prototypeValues validation", () => {
  it.each([0, 13, 2.5, Number.NaN])("order %s is rejected naming order", (order) => {
    expectEngineError(() => prototypeValues("butterworth", order), "INVALID_INPUT", /order must be an integer from 1 to 12/, "order");
  });
  it("unknown family is rejected", () => {
    expectEngineError(() => prototypeValues("elliptic" as never, 3), "INVALID_INPUT", /family must be one of/, "family");
  });
  it("chebyshev needs rippleDb", () => {
    expectEngineError(() => prototypeValues("chebyshev", 3), "INVALID_INPUT", /rippleDb is required/, "rippleDb");
  });
  it.each([0, 0.0009, 6.5, Number.POSITIVE_INFINITY, -1])("ripple %s dB is out of range", (r) => {
    expectEngineError(() => prototypeValues("chebyshev", 3, r), "INVALID_INPUT", /rippleDb must be a number from 0.001 to 6 dB/, "rippleDb");
  });
  it("accepts the range ends", () => {
    expect(prototypeValues("chebyshev", 12, 0.001).g).toHaveLength(12);
    expect(prototypeValues("chebyshev", 1, 6).g).toHaveLength(1);
  });
});

describe("root finders", () => {
  it("Aberth–Ehrlich finds the roots of (x−1)(x−2)…(x−8) and of x² + 1", () => {
    // [C] exact roots by construction
    let c = [1];
    for (let r = 1; r <= 8; r++) {
      const next = new Array<number>(c.length + 1).fill(0);
      c.forEach((ck, k) => {
        next[k + 1] += ck;
        next[k] -= r * ck;
      });
      c = next;
    }
    const roots = findPolynomialRoots(c).map((z) => z.re).sort((x, y) => x - y);
    expectRow(roots, [1, 2, 3, 4, 5, 6, 7, 8], 1e-9, "wilkinson-8");
    const ij = findPolynomialRoots([1, 0, 1]).map((z) => z.im).sort((x, y) => x - y);
    expectRow(ij, [-1, 1], 1e-14, "x^2+1");
  });
  it("reports NO_CONVERGENCE when the iteration cap is hit", () => {
    expectEngineError(() => findPolynomialRoots([1, 2, 3, 4, 5, 6, 1], { maxIterations: 1 }), "NO_CONVERGENCE", /did not converge in 1 iterations/);
  });
  it("rejects a zero constant coefficient", () => {
    expectEngineError(() => findPolynomialRoots([0, 1, 1]), "INVALID_INPUT", /non-zero leading and constant/);
  });
  it("bisection finds π/2 and rejects an unbracketed interval", () => {
    expect(findBracketedRoot(Math.cos, 0, 3)).toBeCloseTo(Math.PI / 2, 14); // [C] cos(π/2) = 0
    expectEngineError(() => findBracketedRoot(Math.cos, 0, 1), "INVALID_INPUT", /not bracketed/);
  });
});

/** Prototype g-values as a shunt-first 1-ohm ladder whose ω = 1 rad/s is the prototype's ω = 1. */
function oneOhmLadder(g: number[]) {
  // synthesizeLadder scales Bessel by w3dB; build a Butterworth-shaped netlist and overwrite values instead.
  const net = synthesizeLadder({ family: "butterworth", type: "lowpass", order: g.length, cutoff: 1 / (2 * Math.PI), z0: 1 });
  net.parts.forEach((p, i) => (p.value = g[i]));
  return net;
}

/** Reverse Bessel polynomial a_k = (2n−k)!/(2^(n−k) k! (n−k)!) (Thomson 1949; [C] here from factorials). */
function besselByFactorials(n: number): number[] {
  const fact = (m: number): number => (m <= 1 ? 1 : m * fact(m - 1));
  const a: number[] = [];
  for (let k = 0; k <= n; k++) a.push(fact(2 * n - k) / (2 ** (n - k) * fact(k) * fact(n - k)));
  return a;
}

/** |Σ a_k (jω)^k|². */
function abs2Poly(a: readonly number[], w: number): number {
  let re = 0;
  let im = 0;
  a.forEach((ak, k) => {
    const m = ak * w ** k;
    [() => (re += m), () => (im += m), () => (re -= m), () => (im -= m)][k % 4]();
  });
  return re * re + im * im;
}
