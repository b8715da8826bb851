import { describe, expect, it } from "vitest";
import { designLMatch } from "../../../shared/engine/synthesis";
import { compileNetlist, createSweepEvaluator, nominalValues } from "../../../shared/engine/solver";
import { analyzeLadder } from "../../oracles/abcd-ladder";
import { expectEngineError as expectCodedError } from "../../helpers/expect-errors";

/** INVALID_INPUT with this message and path (every bad-input case of the synthesis helpers). */
const expectEngineError = (fn: () => unknown, message: RegExp, path: string) => expectCodedError(fn, "INVALID_INPUT", message, path);


/** |S11| from the engine's nodal solver at one frequency. */
function solverS11(net: ReturnType<typeof designLMatch>, f: number): number {
  const compiled = compileNetlist(net);
  const b = createSweepEvaluator(compiled, Float64Array.from([f])).evaluate(nominalValues(compiled));
  return Math.hypot(b.s[0], b.s[1]); // S11 at index ((0·P + 0)·P + 0)·2
}

describe("designLMatch", () => {
  const pairs: [number, number][] = [
    [50, 200], // low → high
    [200, 50], // high → low
    [50, 12.5],
    [3, 50],
    [50, 50.5],
  ];
  for (const [sourceR, loadR] of pairs) {
    for (const form of ["lowpass", "highpass"] as const) {
      it(`${sourceR} ohm → ${loadR} ohm, ${form}: matched at the frequency, shunt on the high side`, () => {
        const freq = 433e6;
        const net = designLMatch({ sourceR, loadR, freq, form });
        // Port 1 sees sourceR when port 2 is terminated in loadR ⇔ S11 = 0 (power waves referred to sourceR)
        const { s11, s21 } = analyzeLadder(net, [freq]);
        expect(Math.hypot(s11[0].re, s11[0].im)).toBeLessThan(1e-9);
        // lossless: all power reaches the load, |S21| = 1 [C] energy balance
        expect(Math.hypot(s21[0].re, s21[0].im)).toBeCloseTo(1, 12);
        expect(solverS11(net, freq)).toBeLessThan(1e-9);
        // off frequency the match is lost (so the check above can fail)
        const off = analyzeLadder(net, [2 * freq]).s11[0];
        expect(Math.hypot(off.re, off.im)).toBeGreaterThan(1e-3);

        expect(net.ports).toEqual([
          { name: "in", node: "n1", z0: sourceR },
          { name: "out", node: "n2", z0: loadR },
        ]);
        const shunt = net.parts.filter((p) => p.nodes.includes("gnd"));
        const series = net.parts.filter((p) => !p.nodes.includes("gnd"));
        expect(shunt).toHaveLength(1);
        expect(series).toHaveLength(1);
        expect(series[0].nodes).toEqual(["n1", "n2"]);
        const highNode = sourceR > loadR ? "n1" : "n2";
        expect(shunt[0].nodes).toEqual([highNode, "gnd"]); // Bowick ch. 4 [M] / docs/references.md §4: shunt across the high-R side
        expect(shunt[0].kind).toBe(form === "lowpass" ? "C" : "L");
        expect(series[0].kind).toBe(form === "lowpass" ? "L" : "C");
        expect(net.parts[0]).toBe(sourceR > loadR ? shunt[0] : series[0]); // refs numbered from the source
        expect(net.parts.map((p) => p.ref)).toEqual(
          sourceR > loadR ? [`${shunt[0].kind}1`, `${series[0].kind}2`] : [`${series[0].kind}1`, `${shunt[0].kind}2`],
        );
      });
    }
  }

  it("50 → 200 ohm at 100 MHz: Q = √3 values (docs/references.md §4)", () => {
    // [C] from docs/references.md §4 (tests/fixtures/generators/closed_form_values.py): Q = √(200/50 − 1) = 1.7321, Xs = 86.603 ohm, Xp = 115.47 ohm ⇒ L = 137.83 nH, C = 13.783 pF
    const lp = designLMatch({ sourceR: 50, loadR: 200, freq: 100e6 });
    expect(lp.parts[0].value).toBeCloseTo(137.83e-9, 11);
    expect(Math.abs(lp.parts[1].value - 13.783e-12)).toBeLessThan(0.5e-15); // half a unit of the printed 0.001 pF
    // high-pass: C = 1/(ω·86.603) = 18.378 pF, L = 115.47/ω = 183.78 nH
    const hp = designLMatch({ sourceR: 50, loadR: 200, freq: 100e6, form: "highpass" });
    expect(Math.abs(hp.parts[0].value - 18.378e-12)).toBeLessThan(0.5e-15); // half a unit of the printed 0.001 pF
    expect(hp.parts[1].value).toBeCloseTo(183.78e-9, 11);
    expect(lp.name).toBe("L-match low-pass, 50 ohm to 200 ohm at 100 MHz");
  });

  it("validation names the parameter", () => {
    expectEngineError(() => designLMatch({ sourceR: 50, loadR: 50, freq: 1e9 }), /sourceR and loadR are equal/, "loadR");
    expectEngineError(() => designLMatch({ sourceR: 0, loadR: 50, freq: 1e9 }), /sourceR must be a finite number above 0 ohm/, "sourceR");
    expectEngineError(() => designLMatch({ sourceR: 50, loadR: Number.NaN, freq: 1e9 }), /loadR must be/, "loadR");
    expectEngineError(() => designLMatch({ sourceR: 50, loadR: 10, freq: -1 }), /freq must be a finite number above 0 Hz/, "freq");
    expectEngineError(() => designLMatch({ sourceR: 50, loadR: 10, freq: 1e9, form: "bandpass" as never }), /form must be/, "form");
  });
});
