import { describe, expect, it } from "vitest";
import { EngineError } from "../../../shared/engine/errors";
import { buildFrequencyGrid } from "../../../shared/engine/frequency-grid";
import { parseMetric, validateLimits } from "../../../shared/engine/limits";
import { limitsSchema } from "../../../shared/schemas/limits";
import { runOptionsSchema } from "../../../shared/schemas/run";

function limitsError(limits: unknown, ports = 2): EngineError {
  try {
    validateLimits(limits, ports);
  } catch (err) {
    if (err instanceof EngineError) return err;
    throw err;
  }
  throw new Error("expected INVALID_LIMITS");
}

describe("limits validation (one test per message)", () => {
  it("accepts the issue's example limit set", () => {
    const rules = validateLimits({ rules: [
      { metric: "s21_db", from: 1e6, to: 80e6, min: -1 },
      { metric: "s21_db", from: 200e6, to: 1e9, max: -40 },
      { metric: "s11_db", from: 1e6, to: 80e6, max: -15, label: "return loss" },
    ] }, 2);
    expect(rules.map((r) => r.parsed)).toEqual([{ kind: "s_db", i: 1, j: 0 }, { kind: "s_db", i: 1, j: 0 }, { kind: "s_db", i: 0, j: 0 }]);
    expect(rules[2].label).toBe("return loss");
  });

  it("band with from ≥ to", () => {
    const e = limitsError({ rules: [{ metric: "s21_db", from: 1e6, to: 80e6, min: -1 }, { metric: "s21_db", from: 2e8, to: 2e8, max: -40 }] });
    expect(e.code).toBe("INVALID_LIMITS");
    expect(e.path).toBe("rules[1].to");
    expect(e.message).toMatch(/rule 2: band must have from < to/);
  });

  it("unknown metric", () => {
    const e = limitsError({ rules: [{ metric: "s21_mag", from: 1e6, to: 2e6, min: -1 }] });
    expect(e.path).toBe("rules[0].metric");
    expect(e.message).toMatch(/unknown metric "s21_mag"/);
  });

  it("port index beyond the netlist's ports", () => {
    const e = limitsError({ rules: [{ metric: "s31_db", from: 1e6, to: 2e6, max: -20 }] }, 2);
    expect(e.path).toBe("rules[0].metric");
    expect(e.message).toMatch(/names port 3 but the netlist has 2 ports/);
    expect(() => validateLimits({ rules: [{ metric: "s31_db", from: 1e6, to: 2e6, max: -20 }] }, 3)).not.toThrow();
  });

  it("no min or max", () => {
    const e = limitsError({ rules: [{ metric: "gd_ns", from: 1e6, to: 2e6 }] });
    expect(e.path).toBe("rules[0].min");
    expect(e.message).toMatch(/needs `min` and\/or `max`/);
  });

  it("min greater than max", () => {
    const e = limitsError({ rules: [{ metric: "ripple_db", from: 1e6, to: 2e6, min: 1, max: 0.5 }] });
    expect(e.path).toBe("rules[0].min");
    expect(e.message).toMatch(/`min` \(1\) is greater than `max` \(0.5\)/);
  });

  it("too many rules, and a non-array", () => {
    const rule = { metric: "s21_db", from: 1e6, to: 2e6, min: -1 };
    expect(limitsError({ rules: Array(101).fill(rule) }).message).toMatch(/at most 100 rules/);
    expect(limitsError({ rule: [] }).message).toMatch(/`rules` array/);
    expect(limitsError({ rules: [{ ...rule, from: -5 }] }).path).toBe("rules[0].from");
  });

  it("metric names parse to zero-based ports", () => {
    expect(parseMetric("s12_db")).toEqual({ kind: "s_db", i: 0, j: 1 });
    expect(parseMetric("gd_ns")).toEqual({ kind: "gd_ns", i: 1, j: 0 });
    expect(parseMetric("s0_db")).toBeNull();
  });

  it("the zod schema rejects the same cases at the edge", () => {
    expect(limitsSchema.safeParse({ rules: [{ metric: "s21_db", from: 2e6, to: 1e6, min: -1 }] }).success).toBe(false);
    expect(limitsSchema.safeParse({ rules: [{ metric: "foo", from: 1e6, to: 2e6, min: -1 }] }).success).toBe(false);
    expect(limitsSchema.safeParse({ rules: [{ metric: "s21_db", from: 1e6, to: 2e6 }] }).success).toBe(false);
    expect(limitsSchema.safeParse({ rules: [{ metric: "s21_db", from: 1e6, to: 2e6, max: -3, label: "x" }] }).success).toBe(true);
  });
});

describe("run options schema (API/CLI edge)", () => {
  it("accepts a full request's options and names bad fields", () => {
    expect(runOptionsSchema.safeParse({ trials: 10000, seed: "lot-7", corners: [-40, 25, 85], targetHalfWidth: 0.01, sweep: { from: 1e6, to: 1e9, points: 201 } }).success).toBe(true);
    const bad = runOptionsSchema.safeParse({ trials: 10, seed: 2 ** 31 });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0].path).toEqual(["seed"]);
    const sweep = runOptionsSchema.safeParse({ trials: 10, seed: 1, sweep: { from: 0, to: 1e9, points: 10 } });
    expect(sweep.error?.issues[0].message).toMatch(/> 0 Hz for a log sweep/);
    expect(runOptionsSchema.safeParse({ trials: 10, seed: 1, trails: 5 }).success).toBe(false); // strict: misspelt field
  });
});

describe("frequency grid", () => {
  it("log grid has exact ends and merges band edges exactly", () => {
    const g = buildFrequencyGrid({ from: 1e6, to: 1e9, points: 4, scale: "log" }, [{ from: 2e6, to: 1e7 }, { from: 1e8, to: 3e9 }]);
    // [C] 1e6·1000^(k/3) = 1e6, 1e7, 1e8, 1e9 (1e7 and 1e8 snap to the identical band edges), plus 2e6 and 3e9
    expect(Array.from(g.freqs)).toEqual([1e6, 2e6, 1e7, 1e8, 1e9, 3e9]);
    expect(g.ranges).toEqual([{ start: 1, end: 3 }, { start: 3, end: 6 }]);
  });

  it("linear grid and dedupe", () => {
    const g = buildFrequencyGrid({ from: 0, to: 10, points: 11, scale: "lin" }, [{ from: 2, to: 2.5 }]);
    expect(g.freqs.length).toBe(12); // [C] 0..10 step 1 plus the new edge 2.5 (2 is already a point)
    expect(g.freqs[3]).toBe(2.5);
    expect(g.ranges[0]).toEqual({ start: 2, end: 4 });
  });

  it("validates the sweep", () => {
    expect(() => buildFrequencyGrid({ from: 0, to: 1e9, points: 10 })).toThrow(/> 0 Hz for a log sweep/);
    expect(() => buildFrequencyGrid({ from: 1e9, to: 1e6, points: 10 })).toThrow(/from < to/);
    expect(() => buildFrequencyGrid({ from: 1e6, to: 1e9, points: 1 })).toThrow(/`points` must be an integer 2..10001/);
    expect(() => buildFrequencyGrid({ from: 1e6, to: 1e9, points: 10002 })).toThrow(EngineError);
  });
});
