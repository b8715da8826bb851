import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { parsePartsCsv } from "../../../shared/formats/parts-csv";
import { formatTolerance, readTolerance } from "../../../shared/tolerance";
import { parseToleranceText } from "../../../src/features/designs/lib/tolerance-text";

// One tolerance reader for the parts table, the grade form, the parts CSV and the command line (issue 11): the same
// text gives the same tolerance in each. Letter codes per IEC 60062:2016 (docs/references or common practice).

const csvTolerance = (text: string, kind: "R" | "L" | "C" = "L", value = "22n") => {
  const { parts } = parsePartsCsv(`ref,kind,node1,node2,value,tolerance\nX1,${kind},a,${kind === "L" ? "b" : "gnd"},${value},${/[,"]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text}\n`);
  return { tolerance: parts[0].tolerance, toleranceAbs: parts[0].toleranceAbs };
};
const strip = (v: { tolerance?: number; toleranceAbs?: number }) => JSON.parse(JSON.stringify(v));

describe("readTolerance", () => {
  it.each([
    ["2.2%", 0.022], ["±0.5 %", 0.005], ["+/-1%", 0.01], ["0.02", 0.02], ["2e-2", 0.02], ["J", 0.05], ["k", 0.1], ["50%", 0.5],
  ])("%j is a relative %d (the double nearest the decimal)", (text, want) => {
    expect(readTolerance(text, "L")).toEqual({ ok: true, value: { tolerance: want } });
  });

  it("reads B C D as pF on a capacitor, % on a resistor, and refuses them on an inductor", () => {
    expect(readTolerance("C", "C", 4.7e-12)).toEqual({ ok: true, value: { toleranceAbs: 0.25e-12 } });
    expect(readTolerance("C", "R")).toEqual({ ok: true, value: { tolerance: 0.0025 } });
    expect(readTolerance("C", "L").ok).toBe(false);
    expect(readTolerance("C", "C", 100e-12)).toMatchObject({ ok: true, warning: expect.stringContaining("may have meant ±0.25 %") });
  });

  it("reads absolute values with a prefix and refuses what is not a tolerance", () => {
    expect(readTolerance("0.25p", "C")).toEqual({ ok: true, value: { toleranceAbs: 0.25e-12 } });
    expect(readTolerance("±50 nH", "L")).toEqual({ ok: true, value: { toleranceAbs: 50e-9 } });
    for (const bad of ["5", "60%", "-2%", "Z", "5 percent", "1e999%"]) expect(readTolerance(bad, "C").ok, bad).toBe(false);
    expect(readTolerance("5", "C")).toMatchObject({ ok: false, error: expect.stringContaining('for 5 % write "5%"') });
  });

  it("agrees with the parts table and the parts CSV on every text (property, 300 cases)", () => {
    const texts = fc.oneof(
      fc.integer({ min: 0, max: 5000 }).map((n) => `${n / 100}%`),
      fc.integer({ min: 0, max: 500 }).map((n) => String(n / 1000)),
      fc.constantFrom("F", "G", "J", "K", "M", "B", "C", "D", "Z", "±2 %", "+/-1%", "2e-2", "0.25p", "0.1 pF", "abc", "5"),
    );
    fc.assert(
      fc.property(texts, fc.constantFrom("R" as const, "L" as const, "C" as const), (text, kind) => {
        const shared = readTolerance(text, kind, kind === "C" ? 4.7e-12 : undefined);
        const table = parseToleranceText(text, kind);
        expect(table.ok).toBe(shared.ok);
        let csv: ReturnType<typeof csvTolerance> | null = null;
        try {
          csv = csvTolerance(text, kind, kind === "C" ? "4.7p" : kind === "R" ? "100" : "22n");
        } catch {
          csv = null;
        }
        expect(csv !== null).toBe(shared.ok);
        if (shared.ok && table.ok) {
          expect(table.value).toEqual(shared.value);
          expect(strip(csv!)).toEqual(strip(shared.value));
        }
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it("reads back what it writes (property over percentages with up to 4 decimals)", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 500_000 }), (n) => {
        const tolerance = Number(`${n}e-6`);
        const text = formatTolerance({ tolerance }, "L");
        expect(readTolerance(text, "L")).toEqual({ ok: true, value: { tolerance } });
      }),
      { numRuns: 300, seed: 12 },
    );
  });
});
