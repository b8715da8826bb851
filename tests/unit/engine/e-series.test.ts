import { describe, expect, it } from "vitest";
import { eSeriesValues, snapToSeries } from "../../../shared/engine/e-series";
import type { ESeriesName } from "../../../shared/engine/netlist";
import { EngineError } from "../../../shared/engine/errors";
import { expectClose } from "../../helpers/expect-close";

// Reference lists typed from docs/references.md §5 (IEC 60063:2015 values, as copied there from the
// Wikipedia "E-series of preferred numbers" tables and the qsl.net E48/E96 copy). Not generated; the [C] facts
// below and these lists against the formula are checked by tests/fixtures/generators/e_series.py.
const REF: Record<ESeriesName, string> = {
  E3: "1.0 2.2 4.7",
  E6: "1.0 1.5 2.2 3.3 4.7 6.8",
  E12: "1.0 1.2 1.5 1.8 2.2 2.7 3.3 3.9 4.7 5.6 6.8 8.2",
  E24: "1.0 1.1 1.2 1.3 1.5 1.6 1.8 2.0 2.2 2.4 2.7 3.0 3.3 3.6 3.9 4.3 4.7 5.1 5.6 6.2 6.8 7.5 8.2 9.1",
  E48: `1.00 1.05 1.10 1.15 1.21 1.27 1.33 1.40 1.47 1.54 1.62 1.69 1.78 1.87 1.96 2.05 2.15 2.26 2.37 2.49 2.61 2.74 2.87 3.01
    3.16 3.32 3.48 3.65 3.83 4.02 4.22 4.42 4.64 4.87 5.11 5.36 5.62 5.90 6.19 6.49 6.81 7.15 7.50 7.87 8.25 8.66 9.09 9.53`,
  E96: `1.00 1.02 1.05 1.07 1.10 1.13 1.15 1.18 1.21 1.24 1.27 1.30 1.33 1.37 1.40 1.43 1.47 1.50 1.54 1.58 1.62 1.65 1.69 1.74
    1.78 1.82 1.87 1.91 1.96 2.00 2.05 2.10 2.15 2.21 2.26 2.32 2.37 2.43 2.49 2.55 2.61 2.67 2.74 2.80 2.87 2.94 3.01 3.09
    3.16 3.24 3.32 3.40 3.48 3.57 3.65 3.74 3.83 3.92 4.02 4.12 4.22 4.32 4.42 4.53 4.64 4.75 4.87 4.99 5.11 5.23 5.36 5.49
    5.62 5.76 5.90 6.04 6.19 6.34 6.49 6.65 6.81 6.98 7.15 7.32 7.50 7.68 7.87 8.06 8.25 8.45 8.66 8.87 9.09 9.31 9.53 9.76`,
  E192: `1.00 1.01 1.02 1.04 1.05 1.06 1.07 1.09 1.10 1.11 1.13 1.14 1.15 1.17 1.18 1.20 1.21 1.23 1.24 1.26 1.27 1.29 1.30 1.32
    1.33 1.35 1.37 1.38 1.40 1.42 1.43 1.45 1.47 1.49 1.50 1.52 1.54 1.56 1.58 1.60 1.62 1.64 1.65 1.67 1.69 1.72 1.74 1.76
    1.78 1.80 1.82 1.84 1.87 1.89 1.91 1.93 1.96 1.98 2.00 2.03 2.05 2.08 2.10 2.13 2.15 2.18 2.21 2.23 2.26 2.29 2.32 2.34
    2.37 2.40 2.43 2.46 2.49 2.52 2.55 2.58 2.61 2.64 2.67 2.71 2.74 2.77 2.80 2.84 2.87 2.91 2.94 2.98 3.01 3.05 3.09 3.12
    3.16 3.20 3.24 3.28 3.32 3.36 3.40 3.44 3.48 3.52 3.57 3.61 3.65 3.70 3.74 3.79 3.83 3.88 3.92 3.97 4.02 4.07 4.12 4.17
    4.22 4.27 4.32 4.37 4.42 4.48 4.53 4.59 4.64 4.70 4.75 4.81 4.87 4.93 4.99 5.05 5.11 5.17 5.23 5.30 5.36 5.42 5.49 5.56
    5.62 5.69 5.76 5.83 5.90 5.97 6.04 6.12 6.19 6.26 6.34 6.42 6.49 6.57 6.65 6.73 6.81 6.90 6.98 7.06 7.15 7.23 7.32 7.41
    7.50 7.59 7.68 7.77 7.87 7.96 8.06 8.16 8.25 8.35 8.45 8.56 8.66 8.76 8.87 8.98 9.09 9.20 9.31 9.42 9.53 9.65 9.76 9.88`,
};
const parse = (text: string) => text.trim().split(/\s+/).map(Number);

describe("eSeriesValues (IEC 60063:2015, docs/references.md §5)", () => {
  for (const name of Object.keys(REF) as ESeriesName[]) {
    it(`${name} matches the published list exactly`, () => {
      const expected = parse(REF[name]);
      expect(expected.length).toBe(Number(name.slice(1))); // N members per decade, IEC 60063
      expect(eSeriesValues(name)).toEqual(expected);
    });
  }

  it("keeps the historical E24 values that differ from round(10^(i/24), 1)", () => {
    // docs/references.md §5: 2.7 3.0 3.3 3.6 3.9 4.3 4.7 8.2 instead of 2.6 2.9 3.2 3.5 3.8 4.2 4.6 8.3
    const e24 = eSeriesValues("E24");
    for (const v of [2.7, 3.0, 3.3, 3.6, 3.9, 4.3, 4.7, 8.2]) expect(e24).toContain(v);
    for (const v of [2.6, 2.9, 3.2, 3.5, 3.8, 4.2, 4.6, 8.3]) expect(e24).not.toContain(v);
  });

  it("lists 9.20 (not the formula's 9.19) at E192 index 185", () => {
    // docs/references.md §5: the only exception to round(10^(i/N), 2) in E48/E96/E192
    expect(eSeriesValues("E192")[185]).toBe(9.2);
    expect(Math.round(100 * 10 ** (185 / 192)) / 100).toBe(9.19); // [C] the formula value
  });
});

describe("snapToSeries", () => {
  const cases: Array<[number, ESeriesName, number, string]> = [
    // [input, series, expected snapped value, source]
    [9.6, "E24", 10, "[C] log distance: ln(10/9.6) = 0.041 < ln(9.6/9.1) = 0.053 → next decade"],
    [0.000483, "E12", 0.00047, "[C] ln(4.83/4.7) = 0.027 < ln(5.6/4.83) = 0.148"],
    [2.2, "E96", 2.21, "docs/references.md §5: 2.2 is not in E96, nearest 2.21"],
    [4.7e-9, "E6", 4.7e-9, "exact member, E6 list"],
    [1.0e-12, "E3", 1.0e-12, "exact member at a decade start"],
    [0.99e-6, "E12", 1.0e-6, "[C] just below a decade: 1.0 of the next decade is nearest"],
    [3.45e4, "E24", 3.6e4, "[C] ln(3.6/3.45) = 0.0426 < ln(3.45/3.3) = 0.0445 (log scale, not linear)"],
    [1.0049e3, "E192", 1.0e3, "[C] ln(1.0049) = 0.00489 < ln(1.01/1.0049) = 0.00506"],
  ];

  for (const [input, name, want, source] of cases) {
    it(`${input} in ${name} → ${want} (${source})`, () => {
      const r = snapToSeries(input, name);
      expectClose(r.value, want, { rtol: 1e-15, label: `snap ${input}` });
      expectClose(r.error, (want - input) / input, { rtol: 1e-12, label: "error" }); // definition: (snapped − value)/value
    });
  }

  it("gives a snapped value that prints as the clean decimal", () => {
    expect(String(snapToSeries(0.000483, "E12").value)).toBe("0.00047");
    expect(String(snapToSeries(4.75e-12, "E96").value)).toBe("4.75e-12");
  });

  it("keeps |error| within half the widest log step of the series (E24 sweep over two decades)", () => {
    // [C] bound from the list itself: the nearest member in log scale is at most √(widest ratio) away;
    // for E24 the widest ratio is 1.5/1.3, so |error| ≤ √(1.5/1.3) − 1 = 0.0742.
    const e24 = [...eSeriesValues("E24"), 10];
    let widest = 1;
    for (let i = 1; i < e24.length; i++) widest = Math.max(widest, e24[i] / e24[i - 1]);
    expectClose(widest, 1.5 / 1.3, { rtol: 1e-15, label: "widest E24 step" });
    for (let x = 1; x < 100; x *= 1.0137) expect(Math.abs(snapToSeries(x, "E24").error)).toBeLessThanOrEqual(Math.sqrt(widest) - 1);
  });

  for (const bad of [0, -1, Number.NaN, Number.POSITIVE_INFINITY]) {
    it(`rejects ${bad} with INVALID_INPUT`, () => {
      expect(() => snapToSeries(bad, "E24")).toThrow(EngineError);
      try {
        snapToSeries(bad, "E24");
      } catch (e) {
        expect((e as EngineError).code).toBe("INVALID_INPUT");
        expect((e as EngineError).message).toMatch(/must be a finite number > 0/);
      }
    });
  }

  it("rejects an unknown series name", () => {
    expect(() => snapToSeries(1, "E7" as ESeriesName)).toThrow(/unknown E series/);
  });
});
