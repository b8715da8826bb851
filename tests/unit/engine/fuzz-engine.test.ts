import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { EngineError, type EngineErrorCode } from "../../../shared/engine/errors";
import { MAX_POINTS } from "../../../shared/engine/frequency-grid";
import { validateLimits } from "../../../shared/engine/limits";
import type { Netlist } from "../../../shared/engine/netlist";
import { planRun } from "../../../shared/engine/run-plan";
import { compileNetlist, createSweepEvaluator, nominalValues, type CompiledNetlist } from "../../../shared/engine/solver";
import { synthesizeLadder } from "../../../shared/engine/synthesis/index";
import { netlistSchema } from "../../../shared/schemas/netlist";
import { applyMutations, EXTREME_NUMBERS, FUZZ_SEED, mutationsArb, nastyValue } from "../../helpers/fuzz-arbitraries";

/**
 * Bad input, fuzzed, straight into the engine: mutated netlists, frequency grids, part values, limit sets and run
 * options. Every call either returns a usable result or throws an EngineError with one of the contract's codes —
 * never a TypeError, a RangeError or NaN in the output — and every call stays fast (a hang or a blow-up fails).
 */

const KNOWN_CODES = new Set<EngineErrorCode>(["INVALID_NETLIST", "INVALID_LIMITS", "INVALID_INPUT", "SINGULAR_MATRIX", "NO_CONVERGENCE", "CANCELLED"]);
/** Slowest a single engine call on these small inputs may be (ms); a 3-part netlist compiles in microseconds. */
const CALL_BUDGET_MS = 2000;

/** 5th-order Butterworth low-pass, 100 MHz, 50 Ω, with tolerances, a lot and parasitics so every field is present. */
function baseNetlist(): Netlist {
  const n = synthesizeLadder({ family: "butterworth", type: "lowpass", order: 5, cutoff: 100e6 });
  return {
    ...n,
    name: "fuzz base",
    parts: n.parts.map((p, k) => ({
      ...p,
      tolerance: 0.05,
      distribution: k % 2 ? "uniform" : "normal",
      lot: k < 2 ? "reel-1" : undefined,
      ...(p.kind === "L" ? { q: { value: 60, at: 1e8 }, srf: 2e9 } : { esr: 0.1, esl: 5e-10, toleranceAbs: 2.5e-13 }),
      tempco: -30,
    })).map((p) => JSON.parse(JSON.stringify(p))),
  };
}

const baseLimits = () => ({
  rules: [
    { metric: "s21_db", from: 1e6, to: 60e6, min: -1, label: "passband" },
    { metric: "s21_db", from: 300e6, to: 1e9, max: -30 },
    { metric: "s11_db", from: 1e6, to: 60e6, max: -10 },
    { metric: "ripple_db", from: 1e6, to: 60e6, max: 0.5 },
    { metric: "gd_ns", from: 1e6, to: 60e6, max: 20 },
  ],
});
const baseOptions = () => ({ trials: 100, seed: 7, sweep: { from: 1e6, to: 1e9, points: 41, scale: "log" }, corners: [-40, 25, 85] });

/** Runs fn; returns its value, or the EngineError it threw (anything else is rethrown and fails the property). */
function engineCall<T>(fn: () => T): { ok: true; value: T } | { ok: false; error: EngineError } {
  const t0 = performance.now();
  try {
    return { ok: true, value: fn() };
  } catch (error) {
    if (!(error instanceof EngineError)) throw new Error(`not an EngineError: ${(error as Error)?.stack ?? String(error)}`);
    expect(KNOWN_CODES.has(error.code), `code ${error.code}`).toBe(true);
    expect(error.message.length).toBeGreaterThan(0);
    return { ok: false, error };
  } finally {
    expect(performance.now() - t0).toBeLessThan(CALL_BUDGET_MS);
  }
}

function expectAllFinite(a: Float64Array, what: string): void {
  for (let k = 0; k < a.length; k++) if (!Number.isFinite(a[k])) throw new Error(`${what}[${k}] = ${a[k]}`);
}

const freqArb = fc.oneof(fc.constantFrom(...EXTREME_NUMBERS), fc.double({ min: 0, max: 1e12, noNaN: true }), fc.double());
const valueArb = fc.oneof(fc.constantFrom(1e-30, 1e-18, 1e-15, 1e-12, 1e-9, 1, 1e6, 1e12, 1e18, 1e30, 5e-324, 1e300), fc.double({ min: 1e-15, max: 1e9, noNaN: true }));

describe("compileNetlist under fuzzed netlists", () => {
  it("compiles a mutated netlist or names the problem with INVALID_NETLIST (400 mutants)", () => {
    let compiled = 0;
    fc.assert(
      fc.property(mutationsArb, (muts) => {
        const netlist = applyMutations(baseNetlist(), muts) as Netlist;
        const r = engineCall(() => compileNetlist(netlist));
        if (r.ok) {
          compiled++;
          expect(r.value.partCount).toBe(netlist.parts.length);
          expect(r.value.portCount).toBe(netlist.ports.length);
        } else expect(r.error.code).toBe("INVALID_NETLIST");
      }),
      { seed: FUZZ_SEED, numRuns: 400 },
    );
    expect(compiled).toBeGreaterThan(0); // the mutants are not all trivially broken
  });

  it("agrees with the JSON schema's shape: whatever the schema accepts compiles or is INVALID_NETLIST (300 mutants)", () => {
    let accepted = 0;
    fc.assert(
      fc.property(mutationsArb, (muts) => {
        const parsed = netlistSchema.safeParse(JSON.parse(JSON.stringify(applyMutations(baseNetlist(), muts)) ?? "null"));
        if (!parsed.success) return;
        accepted++;
        const r = engineCall(() => compileNetlist(parsed.data as Netlist));
        if (!r.ok) expect(r.error.code).toBe("INVALID_NETLIST");
      }),
      { seed: FUZZ_SEED + 1, numRuns: 300 },
    );
    expect(accepted).toBeGreaterThan(0); // the schema accepts some mutants, so the property is not vacuous
  });
});

describe("createSweepEvaluator and evaluate under fuzzed grids and part values", () => {
  const compiled: CompiledNetlist = compileNetlist(baseNetlist());

  it("accepts a grid or rejects it with INVALID_INPUT naming freqs[k]; outputs are finite or SINGULAR_MATRIX (300 grids)", () => {
    fc.assert(
      fc.property(fc.array(freqArb, { minLength: 0, maxLength: 12 }), (freqs) => {
        const r = engineCall(() => createSweepEvaluator(compiled, Float64Array.from(freqs)));
        if (!r.ok) {
          expect(r.error.code).toBe("INVALID_INPUT");
          expect(r.error.path).toMatch(/^freqs\[\d+\]$/);
          return;
        }
        const out = engineCall(() => r.value.evaluate(nominalValues(compiled)));
        if (out.ok) {
          expectAllFinite(out.value.s, "s");
          expectAllFinite(out.value.gd, "gd");
        } else expect(out.error.code).toBe("SINGULAR_MATRIX");
      }),
      { seed: FUZZ_SEED + 2, numRuns: 300 },
    );
  });

  it("solves any positive part values at any temperature, or says SINGULAR_MATRIX / INVALID_INPUT — never NaN (300 trials)", () => {
    const evaluator = createSweepEvaluator(compiled, new Float64Array([1e3, 1e6, 1e8, 1e9, 1e11]));
    fc.assert(
      fc.property(
        fc.array(valueArb, { minLength: compiled.partCount, maxLength: compiled.partCount }),
        fc.oneof(fc.constantFrom(25, -273.15, 500, 1e6, -1e6, Number.NaN, Number.POSITIVE_INFINITY), fc.double({ min: -300, max: 600, noNaN: true })),
        (values, tempC) => {
          const out = engineCall(() => evaluator.evaluate(Float64Array.from(values), tempC));
          if (out.ok) {
            expectAllFinite(out.value.s, "s");
            expectAllFinite(out.value.gd, "gd");
          } else expect(["SINGULAR_MATRIX", "INVALID_INPUT"]).toContain(out.error.code);
        },
      ),
      { seed: FUZZ_SEED + 3, numRuns: 300 },
    );
  });

  it("refuses a values array of the wrong length with INVALID_INPUT", () => {
    const evaluator = createSweepEvaluator(compiled, new Float64Array([1e6]));
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 20 }).filter((n) => n !== compiled.partCount), (n) => {
        const r = engineCall(() => evaluator.evaluate(new Float64Array(n).fill(1e-9)));
        expect(r.ok).toBe(false);
        if (!r.ok) expect(r.error.path).toBe("values");
      }),
      { seed: FUZZ_SEED + 4, numRuns: 20 },
    );
  });
});

describe("validateLimits and planRun under fuzzed limits and options", () => {
  it("validates mutated limits or answers INVALID_LIMITS (400 mutants, 1 to 4 ports)", () => {
    fc.assert(
      fc.property(mutationsArb, fc.integer({ min: 1, max: 4 }), (muts, ports) => {
        const limits = applyMutations(baseLimits(), muts);
        const r = engineCall(() => validateLimits(limits, ports));
        if (r.ok) {
          for (const rule of r.value) expect(rule.from).toBeLessThan(rule.to);
        } else expect(r.error.code).toBe("INVALID_LIMITS");
      }),
      { seed: FUZZ_SEED + 5, numRuns: 400 },
    );
  });

  it("validates random non-documents as limits: INVALID_LIMITS, never a TypeError (200 values)", () => {
    fc.assert(
      fc.property(fc.oneof(nastyValue, fc.anything({ maxDepth: 3 })), (value) => {
        const r = engineCall(() => validateLimits(value, 2));
        if (!r.ok) expect(r.error.code).toBe("INVALID_LIMITS");
      }),
      { seed: FUZZ_SEED + 6, numRuns: 200 },
    );
  });

  it("plans a run from mutated netlist, limits and options, or answers a coded error (250 mutants)", () => {
    let planned = 0;
    fc.assert(
      fc.property(fc.constantFrom("netlist", "limits", "options", "all"), mutationsArb, mutationsArb, mutationsArb, (which, m1, m2, m3) => {
        const netlist = (which === "netlist" || which === "all" ? applyMutations(baseNetlist(), m1) : baseNetlist()) as Netlist;
        const limits = which === "limits" || which === "all" ? applyMutations(baseLimits(), m2) : baseLimits();
        const options = which === "options" || which === "all" ? applyMutations(baseOptions(), m3) : baseOptions();
        const r = engineCall(() => planRun(netlist, limits, options));
        if (r.ok) {
          planned++;
          expect(r.value.grid.freqs.length).toBeLessThanOrEqual(MAX_POINTS + 2 * r.value.rules.length);
          expectAllFinite(r.value.nominalDb, "nominalDb");
        } else expect(["INVALID_NETLIST", "INVALID_LIMITS", "INVALID_INPUT", "SINGULAR_MATRIX"]).toContain(r.error.code);
      }),
      { seed: FUZZ_SEED + 7, numRuns: 250 },
    );
    expect(planned).toBeGreaterThan(0);
  });

  it(`plans a sweep of ${MAX_POINTS} points and refuses ${MAX_POINTS + 1}, naming the limit`, () => {
    const at = (points: number) => engineCall(() => planRun(baseNetlist(), baseLimits(), { ...baseOptions(), corners: [25], sweep: { from: 1e6, to: 1e9, points, scale: "log" } }));
    const ok = at(MAX_POINTS); // README "Data formats": points 2..10001
    expect(ok.ok).toBe(true);
    const refused = at(MAX_POINTS + 1);
    expect(refused.ok).toBe(false);
    if (!refused.ok) {
      expect(refused.error.code).toBe("INVALID_INPUT");
      expect(refused.error.path).toBe("sweep.points");
      expect(refused.error.message).toContain(String(MAX_POINTS));
    }
  });
});
