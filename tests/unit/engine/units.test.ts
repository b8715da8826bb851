import { describe, expect, it } from "vitest";
import { formatSi, parseSi } from "../../../shared/units";

// Expected values: SI prefixes per the SI Brochure (BIPM, 9th ed., Table 7: f 1e-15, p 1e-12, n 1e-9,
// µ 1e-6, m 1e-3, k 1e3, M 1e6, G 1e9, T 1e12); RKM ("4k7", "2n2", "4R7") per IEC 60062 §3 [from memory:
// the letter marks the decimal point and gives the multiplier]. Exact equality: each expected literal is
// the double nearest the decimal value, which the parser must produce.
describe("parseSi", () => {
  const cases: Array<[string, number]> = [
    ["4.7n", 4.7e-9],
    ["33 pF", 33e-12],
    ["33pf", 33e-12],
    ["1.2 GHz", 1.2e9],
    ["1.2k", 1.2e3],
    ["1.2K", 1.2e3],
    ["10", 10],
    ["2.2u", 2.2e-6],
    ["2.2 µF", 2.2e-6],
    ["2.2μF", 2.2e-6], // Greek mu U+03BC as well as micro sign U+00B5
    ["1e-9", 1e-9],
    ["1.5E3 Hz", 1.5e3],
    ["4k7", 4700],
    ["2n2", 2.2e-9],
    ["4R7", 4.7],
    ["470R", 470],
    ["470 Ω", 470],
    ["1 kohm", 1e3],
    ["10 ohms", 10],
    ["1m", 1e-3],
    ["1M", 1e6],
    ["1 MHz", 1e6],
    ["100 mH", 0.1],
    ["1f", 1e-15],
    ["1F", 1],
    ["0.5 fF", 0.5e-15],
    ["3T", 3e12],
    ["-2.5m", -2.5e-3],
    [".5n", 0.5e-9],
    ["  12 nH  ", 12e-9],
  ];
  for (const [text, want] of cases) {
    it(`reads ${JSON.stringify(text)} as ${want}`, () => {
      expect(parseSi(text)).toBe(want);
    });
  }

  for (const bad of ["", "abc", "1..2", "4k7k", "1 x", "k", "1 Mk", "1e", "1,5n", "4.7 nm"]) {
    it(`rejects ${JSON.stringify(bad)} with a clear message`, () => {
      expect(() => parseSi(bad)).toThrow(/cannot read .* as a number with an optional SI prefix/);
    });
  }
});

describe("formatSi", () => {
  const cases: Array<[number, string | undefined, number | undefined, string]> = [
    [4.7e-9, "H", undefined, "4.7 nH"],
    [33e-12, "F", undefined, "33 pF"],
    [1.2e9, "Hz", undefined, "1.2 GHz"],
    [4.7e-9, undefined, undefined, "4.7n"],
    [50, "Ω", undefined, "50 Ω"],
    [999.96, "Ω", undefined, "1 kΩ"], // rounds to 1000 at 4 digits → next prefix
    [1234567, "Hz", 3, "1.23 MHz"],
    [2.2e-6, "F", undefined, "2.2 µF"],
    [0, "F", undefined, "0 F"],
    [-15e-3, "s", undefined, "-15 ms"],
  ];
  for (const [value, unit, digits, want] of cases) {
    it(`formats ${value} ${unit ?? ""} as ${JSON.stringify(want)}`, () => {
      expect(formatSi(value, unit, digits)).toBe(want);
    });
  }

  it("round-trips through parseSi for values across 27 decades", () => {
    for (let e = -15; e <= 12; e++) {
      const v = 4.7 * 10 ** e;
      expect(parseSi(formatSi(v, "F", 6)) / v).toBeCloseTo(1, 12);
    }
  });
});
