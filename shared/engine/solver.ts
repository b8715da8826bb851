/**
 * Lotwise AC nodal solver: compile a netlist once, then evaluate full S-parameter matrices and group
 * delays over a frequency grid for many trials (part-value sets) without allocating.
 *
 * Method (details in solver-evaluate.ts): complex symmetric nodal matrix Y(ω) with ports as Norton
 * sources behind their real z0; internal nodes eliminated by a static-pivot sparse LDLᵀ in a
 * minimum-degree order (port nodes last), the port block inverted with partial pivoting; dense
 * partial-pivoting fallback per frequency when a static pivot is tiny. Power-wave S-parameters
 * S = 2·G^½·Z·G^½ − I (G = diag 1/z0) and group delay gd = −Im(S'/S) with S' from the analytic
 * derivative dZ/dω = −Z·(dY/dω)·Z (forward-mode through the same elimination).
 *
 * @example
 * const compiled = compileNetlist(netlist);
 * const sweep = createSweepEvaluator(compiled, new Float64Array([1e6, 1e8, 1e9]));
 * const out = sweep.evaluate(nominalValues(compiled));   // out.s, out.gd
 * sParamDb(out, 1, 0);                                   // |S21| in dB per frequency
 */
import { EngineError } from "./errors";
import type { Netlist } from "./netlist";
import { valueAtTemperature, writePartParams, PARAM_STRIDE } from "./models";
import { planNetlist, type SolverPlan } from "./solver-compile";
import { createWorkspace, solveSweep, stampTrial } from "./solver-evaluate";

export type { SolverPlan } from "./solver-compile";

/** A validated netlist with its node numbering and symbolic elimination plan. */
export interface CompiledNetlist {
  readonly netlist: Netlist;
  readonly partCount: number;
  readonly portCount: number;
  /** Non-ground node names; index = node number used in the plan. */
  readonly nodeNames: readonly string[];
  /** Reference impedance of each port (ohm), port order. */
  readonly z0: Float64Array;
  /** Symbolic plan: slots, elimination order and op lists (see solver-compile.ts). */
  readonly plan: SolverPlan;
}

/**
 * Validate a netlist and compile it for sweeps.
 *
 * @param netlist - parsed netlist (SI units, node "gnd" = ground)
 * @returns the compiled netlist
 * @throws EngineError INVALID_NETLIST naming the part or port, with `path` such as "parts[2].value":
 *   duplicate refs, a part with both ends on one node, a zero/negative/non-finite value, a dangling
 *   node (one part end, no port), a floating island (no path to ground or a port), a port on ground or
 *   on a node no part touches, duplicate port names, fewer than 2 ports, bad parasitic fields.
 */
export function compileNetlist(netlist: Netlist): CompiledNetlist {
  const { nodeNames, plan } = planNetlist(netlist);
  return {
    netlist,
    partCount: netlist.parts.length,
    portCount: netlist.ports.length,
    nodeNames,
    z0: Float64Array.from(netlist.ports, (p) => p.z0),
    plan,
  };
}

/** Output of a sweep; arrays are owned by the evaluator and overwritten by the next evaluate(). */
export interface SweepBuffers {
  readonly freqs: Float64Array;
  readonly portCount: number;
  /** S-parameters, interleaved complex: index ((f*P + i)*P + j)*2 (+1 for imag) = S_(i+1)(j+1) at freqs[f] */
  readonly s: Float64Array;
  /** group delay −dφ/dω (seconds) of every S_ij, index (f*P + i)*P + j; 0 where S_ij is exactly 0 */
  readonly gd: Float64Array;
}

export interface SweepEvaluator {
  readonly buffers: SweepBuffers;
  /** Solve every frequency with the given actual part values (same order as netlist.parts), at temperature tempC (°C, default 25). No allocation inside. Throws EngineError SINGULAR_MATRIX naming the frequency. */
  evaluate(values: Float64Array, tempC?: number): SweepBuffers;
}

/**
 * Create an evaluator for a compiled netlist on a fixed frequency grid (Hz). The grid is copied.
 *
 * @param compiled - from {@link compileNetlist}
 * @param freqs - frequencies in Hz, finite and ≥ 0 (0 only when the netlist has no ideal inductor)
 * @throws EngineError INVALID_INPUT for a bad frequency (path "freqs[k]")
 */
export function createSweepEvaluator(compiled: CompiledNetlist, freqs: Float64Array): SweepEvaluator {
  const grid = Float64Array.from(freqs);
  for (let f = 0; f < grid.length; f++) {
    const v = grid[f];
    if (!Number.isFinite(v) || v < 0) {
      throw new EngineError("INVALID_INPUT", `\`freqs[${f}]\` must be a finite frequency ≥ 0 Hz (got ${v})`, { path: `freqs[${f}]` });
    }
    if (v === 0 && compiled.plan.idealInductorRef !== null) {
      throw new EngineError(
        "INVALID_INPUT",
        `\`freqs[${f}]\` is 0 Hz, where inductor ${compiled.plan.idealInductorRef} is a short circuit that nodal analysis cannot represent; sweep from a frequency > 0 (or give the inductor a q)`,
        { path: `freqs[${f}]`, details: { ref: compiled.plan.idealInductorRef } },
      );
    }
  }
  const parts = compiled.netlist.parts;
  const refs = parts.map((p) => p.ref);
  const ws = createWorkspace(compiled.plan, compiled.nodeNames, refs, compiled.z0, grid);
  const buffers: SweepBuffers = { freqs: grid, portCount: compiled.portCount, s: ws.s, gd: ws.gd };
  const partCount = parts.length;
  return {
    buffers,
    evaluate(values: Float64Array, tempC = 25): SweepBuffers {
      if (values.length !== partCount) {
        throw new EngineError("INVALID_INPUT", `\`values\` must hold ${partCount} part values (got ${values.length})`, { path: "values" });
      }
      if (!Number.isFinite(tempC)) throw new EngineError("INVALID_INPUT", `\`tempC\` must be a finite temperature in °C (got ${tempC})`, { path: "tempC" });
      for (let k = 0; k < partCount; k++) {
        const part = parts[k];
        const v = valueAtTemperature(values[k], part.tempco, tempC);
        if (!(v > 0 && v < Infinity)) {
          throw new EngineError("INVALID_INPUT", `part ${part.ref}: actual value must be finite and > 0 (got ${v} at ${tempC} °C)`, {
            path: `values[${k}]`,
            details: { ref: part.ref },
          });
        }
        writePartParams(part, v, ws.params, k * PARAM_STRIDE);
      }
      stampTrial(ws);
      solveSweep(ws);
      return buffers;
    },
  };
}

/** Nominal part values (netlist order) as a Float64Array, ready for {@link SweepEvaluator.evaluate}. */
export function nominalValues(compiled: CompiledNetlist): Float64Array {
  return Float64Array.from(compiled.netlist.parts, (p) => p.value);
}

/**
 * |S_ij| in dB, 20·log10|S_ij|, per frequency (−Infinity where S_ij = 0).
 * @param i - zero-based output port; j - zero-based input port (S21 = sParamDb(b, 1, 0))
 */
export function sParamDb(buffers: SweepBuffers, i: number, j: number): Float64Array {
  const { s, freqs } = buffers;
  const p = checkPortPair(buffers, i, j);
  const out = new Float64Array(freqs.length);
  for (let f = 0; f < freqs.length; f++) {
    const o = 2 * ((f * p + i) * p + j);
    out[f] = 10 * Math.log10(s[o] * s[o] + s[o + 1] * s[o + 1]);
  }
  return out;
}

/** Phase of S_ij in degrees, atan2(Im, Re)·180/π in (−180, 180], per frequency. */
export function sParamDeg(buffers: SweepBuffers, i: number, j: number): Float64Array {
  const { s, freqs } = buffers;
  const p = checkPortPair(buffers, i, j);
  const out = new Float64Array(freqs.length);
  for (let f = 0; f < freqs.length; f++) {
    const o = 2 * ((f * p + i) * p + j);
    out[f] = (Math.atan2(s[o + 1], s[o]) * 180) / Math.PI;
  }
  return out;
}

/**
 * Input impedance at a port with the other ports terminated in their z0: Zin = z0·(1 + S_pp)/(1 − S_pp).
 * @param port - zero-based port index
 * @param z0 - that port's reference impedance (ohm)
 * @returns re/im in ohm per frequency (re = Infinity where S_pp = 1 exactly: an open)
 */
export function inputImpedance(buffers: SweepBuffers, port: number, z0: number): { re: Float64Array; im: Float64Array } {
  const p = checkPortPair(buffers, port, port);
  if (!(z0 > 0 && z0 < Infinity)) throw new EngineError("INVALID_INPUT", `\`z0\` must be a finite number > 0 (got ${z0})`, { path: "z0" });
  const { s, freqs } = buffers;
  const re = new Float64Array(freqs.length);
  const im = new Float64Array(freqs.length);
  for (let f = 0; f < freqs.length; f++) {
    const o = 2 * ((f * p + port) * p + port);
    const sr = s[o], si = s[o + 1];
    const dr = 1 - sr, di = -si;
    const den = dr * dr + di * di;
    if (den === 0) { re[f] = Infinity; im[f] = 0; continue; }
    const nr = 1 + sr, ni = si;
    re[f] = (z0 * (nr * dr + ni * di)) / den;
    im[f] = (z0 * (ni * dr - nr * di)) / den;
  }
  return { re, im };
}

function checkPortPair(buffers: SweepBuffers, i: number, j: number): number {
  const p = buffers.portCount;
  for (const [name, v] of [["i", i], ["j", j]] as const) {
    if (!Number.isInteger(v) || v < 0 || v >= p) {
      throw new EngineError("INVALID_INPUT", `\`${name}\` must be a port index 0..${p - 1} (got ${v})`, { path: name });
    }
  }
  return p;
}
