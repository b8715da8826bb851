import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { parseTouchstone, TOUCHSTONE_LIMITS, writeTouchstone, type TouchstoneData } from "../../../shared/formats/touchstone";
import { expectClose, expectComplexClose } from "../../helpers/expect-close";
import { expectFormatError } from "../../helpers/expect-errors";

// Format rules under test: Touchstone File Specification Rev 1.1 and Version 2.0 (IBIS Open Forum),
// as summarized in docs/references.md §8 [S]: option-line defaults GHz / S / MA / R 50, tokens in
// any order, case-insensitive, `!` comments, v1 two-port order N11 N21 N12 N22, v2 keywords.

const FIXTURES = new URL("../../fixtures/formats/", import.meta.url);
const fixture = (name: string) => readFileSync(new URL(name, FIXTURES), "utf8");

type Cx = { re: number; im: number };
const cx = (re: number, im = 0): Cx => ({ re, im });
const cadd = (a: Cx, b: Cx): Cx => cx(a.re + b.re, a.im + b.im);
const csub = (a: Cx, b: Cx): Cx => cx(a.re - b.re, a.im - b.im);
const cmul = (a: Cx, b: Cx): Cx => cx(a.re * b.re - a.im * b.im, a.re * b.im + a.im * b.re);
const cdiv = (a: Cx, b: Cx): Cx => {
  const d = b.re * b.re + b.im * b.im;
  return cx((a.re * b.re + a.im * b.im) / d, (a.im * b.re - a.re * b.im) / d);
};
const polar = (mag: number, deg: number): Cx => cx(mag * Math.cos((deg * Math.PI) / 180), mag * Math.sin((deg * Math.PI) / 180));

/** S_(i+1)(j+1) at frequency index f from the engine layout ((f*P + i)*P + j)*2. */
function sAt(d: TouchstoneData, f: number, i: number, j: number): Cx {
  const k = ((f * d.ports + i) * d.ports + j) * 2;
  return cx(d.s[k], d.s[k + 1]);
}


/**
 * [C] computed by the ABCD cascade of series L = 10 nH then shunt C = 2 pF, 50 Ω ports (Pozar,
 * Microwave Engineering 4th ed., Tables 4.1 and 4.2), with S12 replaced by S21/10 as the fixture
 * generator documents (tests/fixtures/formats/make-touchstone-fixtures.ts).
 */
function ladderS(f: number): { s11: Cx; s21: Cx; s12: Cx; s22: Cx } {
  const R = 50;
  const w = 2 * Math.PI * f;
  const Z = cx(0, w * 10e-9);
  const Y = cx(0, w * 2e-12);
  const A = cadd(cx(1), cmul(Z, Y));
  const bR = cx(Z.re / R, Z.im / R);
  const cR = cx(Y.re * R, Y.im * R);
  const D = cx(1);
  const den = cadd(cadd(A, bR), cadd(cR, D));
  const s21 = cdiv(cx(2), den);
  return {
    s11: cdiv(csub(cadd(A, bR), cadd(cR, D)), den),
    s21,
    s12: cx(s21.re / 10, s21.im / 10),
    s22: cdiv(csub(cadd(bR, D), cadd(A, cR)), den),
  };
}
const LADDER_FREQS = [100e6, 500e6, 1e9, 2.5e9];

describe("fixtures: one response in every format, unit, version and data order", () => {
  const names = [
    ...["ma", "db", "ri"].flatMap((fmt) => ["hz", "mhz", "ghz"].map((u) => `ladder-v1-${fmt}-${u}.s2p`)),
    ...["ma", "db", "ri"].flatMap((fmt) => ["12_21", "21_12"].map((o) => `ladder-v2-${fmt}-${o}.s2p`)),
  ];
  it.each(names)("%s parses to the computed S-parameters within 1e-9 relative", (name) => {
    const d = parseTouchstone(fixture(name), { fileName: name });
    expect(d.version).toBe(name.includes("-v2-") ? "2.0" : "1.1");
    expect(d.ports).toBe(2);
    expect(d.z0).toEqual([50, 50]);
    expectClose(d.freqs, LADDER_FREQS, { rtol: 1e-12, label: `${name} freqs` });
    LADDER_FREQS.forEach((f, k) => {
      const e = ladderS(f);
      // 15 printed digits: 1e-9 relative to |S| is far above the print rounding
      const opts = (what: string, ref: Cx) => ({ rtol: 0, atol: 1e-9 * Math.hypot(ref.re, ref.im), label: `${name} ${what} at ${f} Hz` });
      expectComplexClose(sAt(d, k, 0, 0), e.s11, opts("S11", e.s11));
      expectComplexClose(sAt(d, k, 1, 0), e.s21, opts("S21", e.s21));
      expectComplexClose(sAt(d, k, 0, 1), e.s12, opts("S12", e.s12));
      expectComplexClose(sAt(d, k, 1, 1), e.s22, opts("S22", e.s22));
    });
    expect(d.comments[0]).toMatch(/^Lotwise test fixture/);
  });

  it("a 21_12 file read as 12_21 swaps S12 and S21 (the order keyword matters)", () => {
    const text = fixture("ladder-v2-ri-21_12.s2p").replace("[Two-Port Data Order] 21_12", "[Two-Port Data Order] 12_21");
    const d = parseTouchstone(text);
    const e = ladderS(LADDER_FREQS[0]);
    expectComplexClose(sAt(d, 0, 0, 1), e.s21, { rtol: 1e-9, label: "S12 read from the S21 slot" });
  });
});

describe("option line", () => {
  it("a bare # gives GHz, S, MA, R 50", () => {
    // Touchstone 1.1 defaults (docs/references.md §8): 1 → 1 GHz; 0.5 ∠ 90° → 0.5j; R 50
    const d = parseTouchstone("#\n1 0.5 90\n");
    expect(d.freqs[0]).toBe(1e9);
    expectComplexClose(sAt(d, 0, 0, 0), cx(0, 0.5), { atol: 1e-16 });
    expect(d.z0).toEqual([50]);
    expect(d.version).toBe("1.1");
  });

  it.each([
    ["# S MA R 50", 1e9], // unit missing → GHz
    ["# HZ", 1],
    ["# khz", 1e3],
    ["# MHz", 1e6],
    ["# gHz", 1e9],
  ])("frequency unit of %j scales 2 by %d", (option, scale) => {
    const d = parseTouchstone(`${option}\n2 0.5 0\n`);
    expect(d.freqs[0]).toBe(2 * scale); // Touchstone 1.1: Hz kHz MHz GHz
  });

  it.each([
    ["# MHz S", polar(0.5, 30)], // format missing → MA
    ["# MHz MA", polar(0.5, 30)],
    ["# MHz db", polar(10 ** (0.5 / 20), 30)], // DB: 20·log10|x|, angle in degrees
    ["# MHz RI", cx(0.5, 30)],
  ])("format %j reads the pair (0.5, 30)", (option, expected) => {
    const d = parseTouchstone(`${option}\n100 0.5 30\n`);
    expectComplexClose(sAt(d, 0, 0, 0), expected, { rtol: 1e-15, atol: 1e-16 });
  });

  it("tokens in any order and any case, R with its value anywhere", () => {
    const a = parseTouchstone("# ri r 75 mhz s\n100 0.1 0.2\n");
    const b = parseTouchstone("#R 75 S RI MHZ\n100 0.1 0.2\n");
    for (const d of [a, b]) {
      expect(d.freqs[0]).toBe(100e6);
      expect(d.z0).toEqual([75]);
      expectComplexClose(sAt(d, 0, 0, 0), cx(0.1, 0.2), { rtol: 0 });
    }
  });

  it("only the first option line counts; later ones are ignored", () => {
    const d = parseTouchstone("# MHz S RI R 50\n# GHz S MA R 75\n100 0.1 0.2\n");
    expect(d.freqs[0]).toBe(100e6);
    expect(d.z0).toEqual([50]);
  });
});

describe("Y and Z to S", () => {
  // Series impedance Z between port 1 and port 2 (references R): its admittance matrix is
  // Y = (1/Z)·[[1, −1], [−1, 1]]. Port 2 terminated in R, so Zin = Z + R and
  // S11 = (Zin − R)/(Zin + R) = Z/(Z + 2R). Driving port 1 from Vs behind R: V2 = Vs·R/(Z + 2R),
  // S21 = 2·V2/Vs = 2R/(Z + 2R) (power waves, equal references). [C] hand-derived, evaluated below.
  const Zs = cx(30, 40);
  const R = 50;
  const seriesS11 = cdiv(Zs, cadd(Zs, cx(2 * R)));
  const seriesS21 = cdiv(cx(2 * R), cadd(Zs, cx(2 * R)));
  const yS = cdiv(cx(1), Zs); // 1/Z in siemens

  it("v1 Y (normalized to R) of a series impedance", () => {
    const y = cx(yS.re * R, yS.im * R); // v1: Y·R
    const p = (c: Cx) => `${c.re} ${c.im}`;
    const neg = cx(-y.re, -y.im);
    const d = parseTouchstone(`# MHz Y RI R 50\n100 ${p(y)} ${p(neg)} ${p(neg)} ${p(y)}\n`);
    expectComplexClose(sAt(d, 0, 0, 0), seriesS11, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 0), seriesS21, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 0, 1), seriesS21, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 1), seriesS11, { rtol: 1e-12 });
  });

  it("v2 Y (siemens) of a series impedance", () => {
    const p = (c: Cx) => `${c.re} ${c.im}`;
    const neg = cx(-yS.re, -yS.im);
    const text = `[Version] 2.0\n# MHz Y RI R 50\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Network Data]\n100 ${p(yS)} ${p(neg)} ${p(neg)} ${p(yS)}\n[End]\n`;
    const d = parseTouchstone(text);
    expectComplexClose(sAt(d, 0, 0, 0), seriesS11, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 0), seriesS21, { rtol: 1e-12 });
  });

  // Shunt impedance Z from the common node to ground: Z = Z·[[1, 1], [1, 1]]. With port 2 in R,
  // Zin = Z∥R = ZR/(Z + R), S11 = (Zin − R)/(Zin + R) = −R/(2Z + R); V2 = V1 = Vs·Zin/(Zin + R),
  // S21 = 2·Zin/(Zin + R) = 2Z/(2Z + R). [C] hand-derived.
  const Zp = cx(20, -35);
  const shuntS11 = cdiv(cx(-R), cadd(cmul(cx(2), Zp), cx(R)));
  const shuntS21 = cdiv(cmul(cx(2), Zp), cadd(cmul(cx(2), Zp), cx(R)));

  it("v1 Z (normalized to R) of a shunt impedance", () => {
    const z = `${Zp.re / R} ${Zp.im / R}`;
    const d = parseTouchstone(`# GHz Z RI R 50\n1 ${z} ${z} ${z} ${z}\n`);
    expectComplexClose(sAt(d, 0, 0, 0), shuntS11, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 0), shuntS21, { rtol: 1e-12 });
  });

  it("v2 Z (ohm) of a shunt impedance, also in MA format", () => {
    const mag = Math.hypot(Zp.re, Zp.im);
    const deg = (Math.atan2(Zp.im, Zp.re) * 180) / Math.PI;
    const z = `${mag} ${deg}`;
    const text = `[Version] 2.0\n# GHz Z MA\n[Number of Ports] 2\n[Two-Port Data Order] 21_12\n[Number of Frequencies] 1\n[Reference] 50 50\n[Network Data]\n1 ${z} ${z} ${z} ${z}\n[End]\n`;
    const d = parseTouchstone(text);
    expectComplexClose(sAt(d, 0, 0, 0), shuntS11, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 0, 1), shuntS21, { rtol: 1e-12 });
  });

  it("v2 Z with unequal references [Reference] 50 75 (power waves)", () => {
    // Shunt Z, port 1 on R1 = 50, port 2 on R2 = 75: Zin = Z∥R2, S11 = (Zin − R1)/(Zin + R1);
    // V2 = Vs·Zin/(Zin + R1), S21 = 2·V2/Vs·√(R1/R2) (power-wave definition of the engine contract).
    // S22 likewise with the ports exchanged. [C] hand-derived.
    const R1 = 50;
    const R2 = 75;
    const par = (a: Cx, r: number) => cdiv(cmul(a, cx(r)), cadd(a, cx(r)));
    const zin1 = par(Zp, R2);
    const zin2 = par(Zp, R1);
    const s11 = cdiv(csub(zin1, cx(R1)), cadd(zin1, cx(R1)));
    const s22 = cdiv(csub(zin2, cx(R2)), cadd(zin2, cx(R2)));
    const s21 = cmul(cdiv(cmul(cx(2), zin1), cadd(zin1, cx(R1))), cx(Math.sqrt(R1 / R2)));
    const z = `${Zp.re} ${Zp.im}`;
    const text = `[Version] 2.0\n# Hz Z RI\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Reference] 50 75\n[Network Data]\n1000 ${z} ${z} ${z} ${z}\n[End]\n`;
    const d = parseTouchstone(text);
    expect(d.z0).toEqual([50, 75]);
    expectComplexClose(sAt(d, 0, 0, 0), s11, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 1), s22, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 1, 0), s21, { rtol: 1e-12 });
    expectComplexClose(sAt(d, 0, 0, 1), s21, { rtol: 1e-12 }); // reciprocal
  });

  it("1-port Z and Y: S = (z − 1)/(z + 1) = (1 − y)/(1 + y)", () => {
    // v1 normalized z = 2 + 1j → S = (1 + 1j)/(3 + 1j) = 0.4 + 0.2j [C] by hand: (1+j)(3−j)/10 = (4 + 2j)/10
    const dz = parseTouchstone("# MHz Z RI R 75\n100 2 1\n");
    expectComplexClose(sAt(dz, 0, 0, 0), cx(0.4, 0.2), { rtol: 1e-15 });
    // y = 1/z = (2 − 1j)/5 = 0.4 − 0.2j gives the same S
    const dy = parseTouchstone("# MHz Y RI R 75\n100 0.4 -0.2\n");
    expectComplexClose(sAt(dy, 0, 0, 0), cx(0.4, 0.2), { rtol: 1e-15 });
  });
});

describe("noise data, wrapping, comments, v2 keywords", () => {
  it("a v1 two-port noise block (frequency falls back) is skipped", () => {
    const d = parseTouchstone(fixture("noise-v1.s2p"), { fileName: "noise-v1.s2p" });
    expect(Array.from(d.freqs)).toEqual([1e9, 2e9]);
    expectComplexClose(sAt(d, 1, 1, 1), polar(0.35, -60), { rtol: 1e-15 }); // last S value in the fixture
    expect(d.comments).toContain("noise data: f NFmin(dB) |Gopt| angle(Gopt) Rn/R");
  });

  it("a noise block starting at the last S frequency is skipped too (≤, docs/references.md §8)", () => {
    const d = parseTouchstone("# GHz S RI\n1 0 0 1 0 1 0 0 0\n2 0 0 1 0 1 0 0 0\n2 0.8 0.2 30 0.15\n");
    expect(d.freqs.length).toBe(2);
  });

  it("v2 with [Reference] over two lines, information block, wrapped records, [Noise Data], text after [End]", () => {
    const d = parseTouchstone(fixture("info-noise-v2.s2p"), { fileName: "info-noise-v2.s2p" });
    expect(d.version).toBe("2.0");
    expect(d.z0).toEqual([50, 75]);
    expect(Array.from(d.freqs)).toEqual([100e6, 200e6]);
    // fixture, 21_12 order: 200 MHz record N11 0.2∠20, N21 0.8∠−60, N12 0.04∠35, N22 0.3∠−20
    expectComplexClose(sAt(d, 1, 0, 0), polar(0.2, 20), { rtol: 1e-15 });
    expectComplexClose(sAt(d, 1, 1, 0), polar(0.8, -60), { rtol: 1e-15 });
    expectComplexClose(sAt(d, 1, 0, 1), polar(0.04, 35), { rtol: 1e-15 });
    expectComplexClose(sAt(d, 1, 1, 1), polar(0.3, -20), { rtol: 1e-15 });
    expect(d.comments).toContain("wrapped over three lines");
  });

  it("every number on its own line, comments in between", () => {
    const text = "! head\n# MHz S RI\n100\n0.1 ! S11 re\n0.2\n!\n0.3\n0.4\n0.5\n0.6\n0.7\n0.8\n";
    const d = parseTouchstone(text, { ports: 2 });
    expect(d.ports).toBe(2);
    expect(Array.from(d.s)).toEqual([0.1, 0.2, 0.5, 0.6, 0.3, 0.4, 0.7, 0.8]); // v1 N11 N21 N12 N22
    expect(d.comments).toEqual(["head", "S11 re", ""]);
  });

  it("1-port fixture, CRLF line ends, port count from the first data line", () => {
    const d = parseTouchstone(fixture("one-port.s1p").replace(/\n/g, "\r\n"));
    expect(d.ports).toBe(1);
    expectClose(Array.from(d.s), [-0.333333333333333, 0, -0.333333333333333, 0], { rtol: 0 });
    expect(d.comments[2]).toBe("first point");
  });

  it("v1 3-port, row-major, one matrix row per line (file name gives the port count)", () => {
    const text = "# Hz S RI\n1 11 0 12 0 13 0\n  21 0 22 0 23 0\n  31 0 32 0 33 0\n";
    const d = parseTouchstone(text, { fileName: "three.S3P" });
    expect(d.ports).toBe(3);
    expect(sAt(d, 0, 1, 2).re).toBe(23);
    expect(sAt(d, 0, 2, 0).re).toBe(31);
  });

  it("4 ports from the ports option", () => {
    const row = (i: number) => [1, 2, 3, 4].map((j) => `${10 * i + j} 0`).join(" ");
    const text = `# Hz S RI\n5 ${row(1)}\n${row(2)}\n${row(3)}\n${row(4)}\n`;
    const d = parseTouchstone(text, { ports: 4 });
    expect(sAt(d, 0, 3, 1).re).toBe(42);
  });

  it("v2 [Matrix Format] Lower fills the symmetric upper triangle; a 1-port needs no data order", () => {
    const lower = "[Version] 2.0\n# Hz S RI\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 1\n[Matrix Format] Lower\n[Network Data]\n1 11 0 21 0 22 0\n[End]\n";
    const d = parseTouchstone(lower);
    expect([sAt(d, 0, 0, 0).re, sAt(d, 0, 0, 1).re, sAt(d, 0, 1, 0).re, sAt(d, 0, 1, 1).re]).toEqual([11, 21, 21, 22]);
    const one = parseTouchstone("[Version] 2.0\n# Hz S RI\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n1 0.5 0\n[End]\n");
    expect(one.ports).toBe(1);
  });

  it("limits: 100,001 frequency points are accepted", () => {
    const lines = ["# Hz S RI"];
    for (let k = 1; k <= TOUCHSTONE_LIMITS.maxFrequencies; k++) lines.push(`${k} 0 0`);
    expect(parseTouchstone(lines.join("\n")).freqs.length).toBe(100_001);
  });
});

describe("errors (one named test each: message, line, field)", () => {
  const V2 = (body: string, head = "# GHz S RI R 50\n[Number of Ports] 1\n[Number of Frequencies] 1\n") => `[Version] 2.0\n${head}${body}`;

  it("a value that is not a number", () => {
    expectFormatError(
      () => parseTouchstone("! c\n# GHz S MA R 50\n!\n!\n!\n1 0.1 0 0.9 0 0.1 0 0.1 0\n2 0.1 0 0.9 1.2.3 0.1 0 0.1 0\n"),
      'line 7: S21 angle: not a number ("1.2.3")', 7, "S21 angle",
    );
  });

  it("a frequency that is not a number", () => {
    expectFormatError(() => parseTouchstone("# GHz S RI\n1 0 0\nabc 0 0\n"), 'line 3: frequency: not a number ("abc")', 3, "frequency");
  });

  it("a value too large for a double", () => {
    expectFormatError(() => parseTouchstone("# GHz S DB\n1 1e999 0\n"), 'line 2: S11 dB: not a number ("1e999")', 2, "S11 dB");
  });

  it("a negative frequency", () => {
    expectFormatError(() => parseTouchstone("# GHz S RI\n-1 0 0\n"), "line 2: frequency: must be ≥ 0 (got -1)", 2, "frequency");
  });

  it("frequencies not strictly increasing (1-port)", () => {
    expectFormatError(() => parseTouchstone("# MHz S RI\n1 0 0\n2 0 0\n2 0 0\n"), "line 4: frequency: frequencies must be strictly increasing (2 after 2)", 4, "frequency");
  });

  it("frequencies not strictly increasing (v2 two-port, where no noise block can start)", () => {
    const text = "[Version] 2.0\n# Hz S RI\n[Number of Ports] 2\n[Two-Port Data Order] 12_21\n[Number of Frequencies] 2\n[Network Data]\n2 0 0 0 0 0 0 0 0\n1 0 0 0 0 0 0 0 0\n[End]\n";
    expectFormatError(() => parseTouchstone(text), "line 8: frequency: frequencies must be strictly increasing (1 after 2)", 8, "frequency");
  });

  it("the data ends inside a record", () => {
    expectFormatError(() => parseTouchstone("# MHz S MA\n100 0.1 0 0.9 0\n 0.1 0 0.2\n", { ports: 2 }), "line 3: S22 angle: missing: the data ends inside a record", 3, "S22 angle");
  });

  it("data before the option line", () => {
    expectFormatError(() => parseTouchstone("! no option line\n1 0.5 0\n"), 'line 2: option line: data before the option line (e.g. "# GHz S MA R 50")', 2, "option line");
  });

  it("an unknown option-line token", () => {
    expectFormatError(() => parseTouchstone("# GHz S MAG R 50\n1 0.5 0\n"), 'line 1: option line: unknown token "MAG" (expected Hz, kHz, MHz, GHz, S, Y, Z, DB, MA, RI or R n)', 1, "option line");
  });

  it("an option-line token given twice", () => {
    expectFormatError(() => parseTouchstone("# GHz MHz\n1 0.5 0\n"), 'line 1: option line: frequency unit given twice ("MHz")', 1, "option line");
  });

  it("R without its value", () => {
    expectFormatError(() => parseTouchstone("# GHz S MA R\n1 0.5 0\n"), "line 1: option line: R must be followed by the reference resistance", 1, "option line");
  });

  it("R followed by a word", () => {
    expectFormatError(() => parseTouchstone("# GHz R MA\n1 0.5 0\n"), 'line 1: option line: R must be followed by the reference resistance (got "MA")', 1, "option line");
  });

  it("R not positive", () => {
    expectFormatError(() => parseTouchstone("# GHz R 0\n1 0.5 0\n"), "line 1: option line: reference resistance must be > 0 (got 0)", 1, "option line");
  });

  it("H parameters", () => {
    expectFormatError(() => parseTouchstone("# GHz H MA\n1 0.5 0\n"), "line 1: option line: H parameters are not supported (Lotwise reads S, Y and Z)", 1, "option line");
  });

  it("G parameters", () => {
    expectFormatError(() => parseTouchstone("! x\n# g GHz\n1 0.5 0\n"), "line 2: option line: G parameters are not supported (Lotwise reads S, Y and Z)", 2, "option line");
  });

  it("a keyword in a version 1.1 file", () => {
    expectFormatError(() => parseTouchstone("# GHz\n[Number of Ports] 1\n"), "line 2: keyword: keyword [Number of Ports] in a version 1.1 file ([Version] 2.0 must be the first line)", 2, "keyword");
  });

  it("[Version] twice", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n[Version] 2.0\n"), "line 2: [Version]: [Version] must be the first line that is not a comment", 2, "[Version]");
  });

  it("an unsupported version", () => {
    expectFormatError(() => parseTouchstone("! x\n[Version] 3.0\n"), 'line 2: [Version]: version "3.0" is not supported (Lotwise reads 1.1 and 2.0)', 2, "[Version]");
  });

  it("an unknown keyword", () => {
    expectFormatError(() => parseTouchstone(V2("[Frobnicate] 1\n")), "line 5: keyword: unknown keyword [Frobnicate]", 5, "keyword");
  });

  it("a keyword without its closing bracket", () => {
    expectFormatError(() => parseTouchstone(V2("[Network Data\n")), 'line 5: keyword: malformed keyword "[Network Data" (missing "]")', 5, "keyword");
  });

  it("[Number of Ports] not a whole number", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] two\n"), 'line 3: [Number of Ports]: must be a whole number ≥ 1 (got "two")', 3, "[Number of Ports]");
  });

  it("more than 4 ports in a v2 file", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 6\n"), "line 3: [Number of Ports]: 6 ports: at most 4 ports are supported", 3, "[Number of Ports]");
  });

  it("more than 4 ports from the ports option", () => {
    expectFormatError(() => parseTouchstone("# GHz\n1 0 0\n", { ports: 5 }), "ports: 5 ports: at most 4 ports are supported", undefined, "ports");
  });

  it("more than 4 ports from the file name", () => {
    expectFormatError(() => parseTouchstone("# GHz\n1 0 0\n", { fileName: "big.s6p" }), "ports: 6 ports (file name big.s6p): at most 4 ports are supported", undefined, "ports");
  });

  it("[Number of Ports] disagrees with the file name", () => {
    expectFormatError(
      () => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 1\n", { fileName: "a.s2p" }),
      "line 3: [Number of Ports]: the file declares 1 ports but 2 were expected (from the file name a.s2p)", 3, "[Number of Ports]",
    );
  });

  it("[Two-Port Data Order] with a bad value", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 2\n[Two-Port Data Order] 11_22\n"), 'line 4: [Two-Port Data Order]: must be 12_21 or 21_12 (got "11_22")', 4, "[Two-Port Data Order]");
  });

  it("[Two-Port Data Order] missing in a 2-port v2 file", () => {
    expectFormatError(
      () => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 2\n[Number of Frequencies] 1\n[Network Data]\n"),
      "line 5: [Two-Port Data Order]: missing before [Network Data] (required for 2-port files)", 5, "[Two-Port Data Order]",
    );
  });

  it("[Number of Frequencies] missing", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 1\n[Network Data]\n"), "line 4: [Number of Frequencies]: missing before [Network Data] (required in version 2.0)", 4, "[Number of Frequencies]");
  });

  it("[Number of Frequencies] above the limit", () => {
    expectFormatError(
      () => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 1\n[Number of Frequencies] 100002\n"),
      "line 4: [Number of Frequencies]: 100002 frequencies: at most 100001 frequency points are supported", 4, "[Number of Frequencies]",
    );
  });

  it("[Number of Frequencies] larger than the data", () => {
    expectFormatError(
      () => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 1\n[Number of Frequencies] 3\n[Network Data]\n1 0 0\n2 0 0\n[End]\n"),
      "line 8: [Number of Frequencies]: declares 3 frequencies (line 4) but [Network Data] has 2", 8, "[Number of Frequencies]",
    );
  });

  it("more data than [Number of Frequencies]", () => {
    expectFormatError(
      () => parseTouchstone(V2("[Network Data]\n1 0 0\n2 0 0\n[End]\n")),
      "line 7: [Number of Frequencies]: more data than the 1 frequencies declared on line 4", 7, "[Number of Frequencies]",
    );
  });

  it("[Reference] before [Number of Ports]", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Reference] 50\n"), "line 3: [Reference]: [Number of Ports] must come before [Reference]", 3, "[Reference]");
  });

  it("[Reference] with too few values", () => {
    expectFormatError(
      () => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 2\n[Reference] 50\n[Number of Frequencies] 1\n"),
      "line 4: [Reference]: needs 2 values, found 1 before the next keyword (line 5)", 4, "[Reference]",
    );
  });

  it("[Reference] with too many values", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 1\n[Reference] 50 75\n"), 'line 4: [Reference]: more than 1 values ("75")', 4, "[Reference]");
  });

  it("[Reference] with a value that is not a resistance", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Ports] 2\n[Reference]\n50 -75\n"), 'line 5: [Reference]: not a resistance > 0 ("-75")', 5, "[Reference]");
  });

  it("[Matrix Format] with a bad value", () => {
    expectFormatError(() => parseTouchstone(V2("[Matrix Format] Diagonal\n")), 'line 5: [Matrix Format]: must be Full, Lower or Upper (got "Diagonal")', 5, "[Matrix Format]");
  });

  it("[Mixed-Mode Order]", () => {
    expectFormatError(() => parseTouchstone(V2("[Mixed-Mode Order] D2,1 C2,1\n")), "line 5: [Mixed-Mode Order]: mixed-mode data is not supported (Lotwise reads single-ended S, Y and Z)", 5, "[Mixed-Mode Order]");
  });

  it("data outside [Network Data]", () => {
    expectFormatError(() => parseTouchstone(V2("1 0 0\n")), 'line 5: keyword: data outside [Network Data] ("1 0 0")', 5, "keyword");
  });

  it("a keyword inside [Network Data]", () => {
    expectFormatError(
      () => parseTouchstone(V2("[Network Data]\n1 0 0\n[Reference] 50\n")),
      "line 7: keyword: keyword [Reference] inside [Network Data] (only [Noise Data] or [End] may follow)", 7, "keyword",
    );
  });

  it("[Network Data] twice", () => {
    expectFormatError(() => parseTouchstone(V2("[Network Data]\n1 0 0\n[Noise Data]\n[Network Data]\n")), "line 8: [Network Data]: appears twice", 8, "[Network Data]");
  });

  it("no option line in a v2 file", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n[Number of Ports] 1\n[Number of Frequencies] 1\n[Network Data]\n"), 'line 4: option line: missing before [Network Data] (e.g. "# GHz S MA R 50")', 4, "option line");
  });

  it("no [Number of Ports] in a v2 file", () => {
    expectFormatError(() => parseTouchstone("[Version] 2.0\n# GHz\n[Number of Frequencies] 1\n[Network Data]\n"), "line 4: [Number of Ports]: missing before [Network Data] (required in version 2.0)", 4, "[Number of Ports]");
  });

  it("an empty file", () => {
    expectFormatError(() => parseTouchstone("! only a comment\n"), "line 1: frequency: the file has no network data", 1, "frequency");
  });

  it("a v2 file with an empty [Network Data]", () => {
    expectFormatError(() => parseTouchstone(V2("[Network Data]\n[End]\n")), "line 6: [Number of Frequencies]: declares 1 frequencies (line 4) but [Network Data] has 0", 6, "[Number of Frequencies]");
  });

  it("a port count that cannot be told", () => {
    expectFormatError(
      () => parseTouchstone("# GHz S RI\n1 0 0 0 0 0 0\n"),
      "line 2: ports: cannot tell the number of ports from 7 numbers on the first data line; give the file name (.s3p) or the port count", 2, "ports",
    );
  });

  it("more than 100,001 frequency points", () => {
    const lines = ["# Hz S RI"];
    for (let k = 1; k <= TOUCHSTONE_LIMITS.maxFrequencies + 1; k++) lines.push(`${k} 0 0`);
    expectFormatError(() => parseTouchstone(lines.join("\n")), "line 100003: frequency: too many frequencies: at most 100001 frequency points are supported", 100_003, "frequency");
  });

  it("Z data that cannot be converted to S", () => {
    // normalized z = −1: z + 1 = 0
    expectFormatError(() => parseTouchstone("# MHz Z RI\n1 0 0\n2 -1 0\n"), "line 3: Z data: cannot be converted to S at 2000000 Hz (Z + R is singular)", 3, "Z data");
  });

  it("a bad ports option is a caller error (INVALID_INPUT)", () => {
    expect(() => parseTouchstone("# GHz\n1 0 0\n", { ports: 1.5 })).toThrow(expect.objectContaining({ code: "INVALID_INPUT", field: "ports" }));
  });
});

describe("writeTouchstone", () => {
  /** Invented 1..4-port data: distinct values in every slot, both signs. */
  function sample(P: number, nF: number): { freqs: Float64Array; s: Float64Array } {
    const freqs = Float64Array.from({ length: nF }, (_, f) => 1e6 * (1 + 7 * f) + 123.25);
    const s = new Float64Array(nF * P * P * 2);
    for (let k = 0; k < s.length; k++) s[k] = Math.sin(1.3 * k + 0.2) * 0.9;
    return { freqs, s };
  }

  for (const P of [1, 2, 3, 4]) {
    for (const format of ["MA", "DB", "RI"] as const) {
      for (const unit of ["Hz", "MHz", "GHz"] as const) {
        it(`round trip: ${P} port(s), ${format}, ${unit}`, () => {
          const { freqs, s } = sample(P, 5);
          const text = writeTouchstone({ freqs, s, ports: P, z0: 75 }, { format, unit, comment: ["made by a Lotwise test", "second line"] });
          const d = parseTouchstone(text, { fileName: `x.s${P}p` });
          expect(d.version).toBe("1.1");
          expect(d.ports).toBe(P);
          expect(d.z0).toEqual(new Array(P).fill(75));
          expect(d.comments).toEqual(["made by a Lotwise test", "second line"]);
          expectClose(d.freqs, freqs, { rtol: 1e-15 });
          // 12 significant digits written: 1e-9 of the largest |S| bounds the print rounding with room
          expectClose(d.s, s, { rtol: 0, atol: 1e-9, label: `${P}-port ${format} ${unit}` });
        });
      }
    }
  }

  it("writes the exact v1.1 text for a simple 2-port (hand-written expectation)", () => {
    // S11 = 0.5, S21 = 0.5j, S12 = −0.5j (made up), S22 = 0 at 1 GHz; MA, GHz default; v1 order N11 N21 N12 N22
    const s = new Float64Array([0.5, 0, 0, -0.5, 0, 0.5, 0, 0]);
    const text = writeTouchstone({ freqs: new Float64Array([1e9]), s, ports: 2, z0: 50 }, { comment: ["hello"] });
    expect(text).toBe("! hello\n# GHz S MA R 50\n1 0.5 0 0.5 90 0.5 -90 0 0\n");
  });

  it("a zero magnitude in DB reads back as (almost) zero", () => {
    const text = writeTouchstone({ freqs: new Float64Array([1]), s: new Float64Array([0, 0]), ports: 1, z0: 50 }, { format: "DB", unit: "Hz" });
    // −6000 dB is Lotwise's own writer floor, not a Touchstone-spec value: shared/formats/touchstone.ts writes
    // 20·log10(max(|S|, 1e-300)) = −6000 dB for |S| = 0 (see its doc comment).
    expect(text).toBe("# Hz S DB R 50\n1 -6000 0\n");
    expect(parseTouchstone(text).s[0]).toBeLessThan(1e-299);
  });

  it("3 ports wrap one matrix row per line", () => {
    const { freqs, s } = sample(3, 1);
    const lines = writeTouchstone({ freqs, s, ports: 3, z0: 50 }, { format: "RI" }).trimEnd().split("\n");
    expect(lines.length).toBe(1 + 3); // option line + 3 rows
    expect(lines[2].trim().split(/\s+/).length).toBe(6);
  });

  it.each([
    ["ports", { ports: 5 }],
    ["freqs", { freqs: new Float64Array([2, 1]) }],
    ["s", { s: new Float64Array(3) }],
    ["z0", { z0: 0 }],
  ])("rejects a bad %s (INVALID_INPUT)", (field, patch) => {
    const base = { freqs: new Float64Array([1, 2]), s: new Float64Array(4), ports: 1, z0: 50 };
    expect(() => writeTouchstone({ ...base, ...patch })).toThrow(expect.objectContaining({ code: "INVALID_INPUT", field }));
  });
});
