/**
 * Lossless L-section matching between two resistances.
 */
import { EngineError } from "../errors";
import { GROUND_NODE, type Netlist, type Part } from "../netlist";
import { formatHz } from "./transforms";
import type { LMatchSpec } from "./types";

/**
 * Two-element L-section that presents `sourceR` at port 1 when port 2 is terminated in `loadR`, at `freq`.
 *
 * Q = √(Rhigh/Rlow − 1); the series element sits on the low-resistance side with |Xs| = Q·Rlow and the
 * shunt element across the high-resistance side with |Xp| = Rhigh/Q (Bowick, RF Circuit Design, 1982,
 * ch. 4; the same result as Pozar 4th ed. sec. 5.1 with XL = 0). Low-pass form: series L = |Xs|/ω,
 * shunt C = 1/(ω|Xp|); high-pass form: series C = 1/(ω|Xs|), shunt L = |Xp|/ω. ω = 2π·freq.
 * Port 1 "in" = source side (node n1, z0 = sourceR), port 2 "out" = load side (node n2, z0 = loadR). Refs are numbered from
 * the source: shunt element at the source side when sourceR > loadR (C1/L1 shunt, then L2/C2 series),
 * else series first, shunt across the load (L1/C1 series, C2/L2 shunt).
 *
 * @throws EngineError INVALID_INPUT naming `sourceR`, `loadR`, `freq` or `form`; equal resistances need no L-section
 * @example designLMatch({ sourceR: 50, loadR: 200, freq: 100e6 }).parts
 * // returns [{ ref: "L1", nodes: ["n1", "n2"], value ≈ 1.3783e-7 }, { ref: "C2", nodes: ["n2", "gnd"], value ≈ 1.3783e-11 }]
 */
export function designLMatch(spec: LMatchSpec): Netlist {
  const { sourceR, loadR, freq, form } = validateLMatchInput(spec);
  const w = 2 * Math.PI * freq;
  const rHigh = Math.max(sourceR, loadR);
  const rLow = Math.min(sourceR, loadR);
  const q = Math.sqrt(rHigh / rLow - 1);
  const xs = q * rLow;
  const xp = rHigh / q;
  const shuntAtSource = sourceR > loadR;
  const shuntNode = shuntAtSource ? "n1" : "n2";
  const shuntPos = shuntAtSource ? 1 : 2;
  const seriesPos = shuntAtSource ? 2 : 1;
  const series: Part =
    form === "lowpass"
      ? { ref: `L${seriesPos}`, kind: "L", nodes: ["n1", "n2"], value: xs / w }
      : { ref: `C${seriesPos}`, kind: "C", nodes: ["n1", "n2"], value: 1 / (w * xs) };
  const shunt: Part =
    form === "lowpass"
      ? { ref: `C${shuntPos}`, kind: "C", nodes: [shuntNode, GROUND_NODE], value: 1 / (w * xp) }
      : { ref: `L${shuntPos}`, kind: "L", nodes: [shuntNode, GROUND_NODE], value: xp / w };
  return {
    name: `L-match ${form === "lowpass" ? "low-pass" : "high-pass"}, ${sourceR} ohm to ${loadR} ohm at ${formatHz(freq)}`,
    ports: [
      { name: "in", node: "n1", z0: sourceR },
      { name: "out", node: "n2", z0: loadR },
    ],
    parts: shuntAtSource ? [shunt, series] : [series, shunt],
  };
}

function validateLMatchInput(spec: LMatchSpec): Required<LMatchSpec> {
  if (spec === null || typeof spec !== "object") throw new EngineError("INVALID_INPUT", "spec must be an object");
  for (const key of ["sourceR", "loadR", "freq"] as const) {
    const v = spec[key];
    if (typeof v !== "number" || !Number.isFinite(v) || v <= 0) {
      const unit = key === "freq" ? "Hz" : "ohm";
      throw new EngineError("INVALID_INPUT", `${key} must be a finite number above 0 ${unit} (got ${String(v)})`, {
        path: key,
      });
    }
  }
  const form = spec.form ?? "lowpass";
  if (form !== "lowpass" && form !== "highpass") {
    throw new EngineError("INVALID_INPUT", `form must be "lowpass" or "highpass" (got ${String(spec.form)})`, {
      path: "form",
    });
  }
  if (spec.sourceR === spec.loadR) {
    throw new EngineError(
      "INVALID_INPUT",
      `sourceR and loadR are equal (${spec.sourceR} ohm): they are already matched and an L-section needs two different resistances`,
      { path: "loadR" },
    );
  }
  return { sourceR: spec.sourceR, loadR: spec.loadR, freq: spec.freq, form };
}
