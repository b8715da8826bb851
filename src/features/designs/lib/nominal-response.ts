import { buildFrequencyGrid, type SweepSpec } from "@shared/engine/frequency-grid";
import type { Netlist } from "@shared/engine/netlist";
import { compileNetlist, createSweepEvaluator, nominalValues, sParamDb } from "@shared/engine/solver";

/** The nominal response on the sweep grid: |S21|, |S11| in dB and the S21 group delay in ns. */
export type NominalResponse = { freqs: Float64Array; s21Db: Float64Array; s11Db: Float64Array; gdNs: Float64Array };

/**
 * Solves the netlist at its nominal values in the browser (the same engine the workers run).
 * Group delay −dφ21/dω comes from the engine's buffer (index (f·P + 1)·P + 0), converted s → ns.
 * @param bands extra frequencies to include exactly (limit band edges), Hz
 * @throws EngineError for a netlist or sweep the engine refuses
 */
export function computeNominal(netlist: Netlist, sweep: SweepSpec, bands: { from: number; to: number }[] = []): NominalResponse {
  const compiled = compileNetlist(netlist);
  const grid = buildFrequencyGrid(sweep, bands);
  const evaluator = createSweepEvaluator(compiled, grid.freqs);
  const buffers = evaluator.evaluate(nominalValues(compiled));
  const p = buffers.portCount;
  const gdNs = new Float64Array(grid.freqs.length);
  for (let f = 0; f < gdNs.length; f++) gdNs[f] = buffers.gd[(f * p + 1) * p + 0] * 1e9;
  return { freqs: Float64Array.from(buffers.freqs), s21Db: sParamDb(buffers, 1, 0), s11Db: sParamDb(buffers, 0, 0), gdNs };
}

/**
 * A sweep around a netlist's characteristic frequency: a decade either side of f = 1/(2π√(L̄·C̄)),
 * L̄ and C̄ the geometric means of its inductors and capacitors; 1 MHz–1 GHz when it has neither.
 */
export function suggestSweep(netlist: Netlist): SweepSpec & { scale: "log" } {
  const logMean = (kind: "L" | "C") => {
    const vs = netlist.parts.filter((p) => p.kind === kind).map((p) => Math.log(p.value));
    return vs.length ? Math.exp(vs.reduce((a, b) => a + b, 0) / vs.length) : null;
  };
  const l = logMean("L");
  const c = logMean("C");
  if (l === null || c === null) return { from: 1e6, to: 1e9, points: 201, scale: "log" };
  const f0 = 1 / (2 * Math.PI * Math.sqrt(l * c));
  const decade = Math.pow(10, Math.floor(Math.log10(f0)));
  return { from: decade / 10, to: decade * 100, points: 301, scale: "log" };
}
