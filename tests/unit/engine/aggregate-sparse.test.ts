import { describe, expect, it } from "vitest";
import { createAggregate, decodeAggregate, denseEnvelope, encodeAggregate, mergeInto } from "../../../shared/engine/aggregate";
import { evaluateTrials } from "../../../shared/engine/monte-carlo";
import { finalizeRun } from "../../../shared/engine/result";
import { planRun } from "../../../shared/engine/run-plan";
import { synthesizeLadder } from "../../../shared/engine/synthesis/index";

// A chunk of few trials fills few of the envelope's cells: it travels as (index, count) pairs, so the server's merge
// follows the trials, not the 4-million-cell envelope (issue 10: the request thread must stay free). The merged total
// and the result are the same either way.

const netlist = { ...synthesizeLadder({ family: "butterworth", type: "lowpass", order: 5, cutoff: 100e6 }) };
netlist.parts = netlist.parts.map((p) => ({ ...p, tolerance: 0.05 }));
const limits = { rules: [{ metric: "s21_db", from: 1e6, to: 70e6, min: -1 }] };
const plan = planRun(netlist, limits, { trials: 400, seed: 3, sweep: { from: 1e6, to: 1e9, points: 2001 } });

describe("sparse envelope transport", () => {
  it("sends a one-trial chunk as pairs, a thousandth of the dense size, and merges it to the same total", () => {
    const one = evaluateTrials(plan, 7, 1);
    const packed = encodeAggregate(one);
    const back = decodeAggregate(packed);
    expect(back.envelopeSparse).toBeDefined();
    expect(back.envelopeCounts.length).toBe(0);
    expect(Array.from(denseEnvelope(back))).toEqual(Array.from(one.envelopeCounts));
    expect(packed.byteLength).toBeLessThan(one.envelopeCounts.byteLength / 20);
  });

  it("a run merged from sparse chunks equals one merged from dense chunks, and a mostly filled one stays dense", () => {
    const dense = createAggregate(plan);
    const viaWire = createAggregate(plan);
    for (let start = 0; start < 400; start += 25) {
      const chunk = evaluateTrials(plan, start, 25);
      mergeInto(dense, chunk);
      mergeInto(viaWire, decodeAggregate(encodeAggregate(chunk)));
    }
    expect(Array.from(viaWire.envelopeCounts)).toEqual(Array.from(dense.envelopeCounts));
    expect(JSON.stringify(finalizeRun(viaWire))).toBe(JSON.stringify(finalizeRun(dense)));
    const full = createAggregate(plan);
    full.envelopeCounts.fill(1); // most cells filled: the dense form is the smaller one
    const fullBack = decodeAggregate(encodeAggregate(full));
    expect(fullBack.envelopeSparse).toBeUndefined();
    expect(fullBack.envelopeCounts.length).toBe(full.envelopeCounts.length);
  });
});
