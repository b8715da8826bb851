/**
 * Part admittance models of the Lotwise nodal solver.
 *
 * Every part is split into a part that is linear in the basis {1, jω, 1/(jω)} and an optional
 * series R-L-C branch:
 *
 *   y(ω) = g + jωc + γ/(jω) + 1/z_b(ω),   z_b(ω) = r + j(ω·l − k/ω)   (k = 1/C of the branch, 0 = no C)
 *
 * - R:  g = 1/R.
 * - L (ideal):  γ = 1/L.  With `q`: branch r = 2π·q.at·L/q.value, l = L (Q is a constant-R loss model
 *   matching the stated Q at `q.at`).  With `srf`: a parallel c = 1/((2π·srf)²·L), sized from the actual
 *   L so the trial keeps the stated self-resonance.
 * - C (ideal):  c = C.  With `esr` or `esl`: branch r = esr, l = esl, k = 1/C.
 * - tempco: value(T) = value·(1 + tempco·1e-6·(T − 25)) (ppm/°C) for the main value only; Q, srf, ESR
 *   and ESL are taken as temperature independent.
 *
 * Derivatives for group delay: dy/dω = jc + jγ/ω² − z_b'/z_b², z_b' = j(l + k/ω²).
 */
import type { Part } from "./netlist";

/** Parameters per part, stride {@link PARAM_STRIDE} in a Float64Array. */
export const PARAM_G = 0;
export const PARAM_C = 1;
export const PARAM_GAMMA = 2;
export const PARAM_R = 3;
export const PARAM_L = 4;
export const PARAM_K = 5;
export const PARAM_STRIDE = 6;

/** True when the part's model has a series R-L-C branch (a lossy inductor, or a capacitor with ESR/ESL). */
export function hasSeriesBranch(part: Part): boolean {
  if (part.kind === "L") return part.q !== undefined;
  if (part.kind === "C") return (part.esr ?? 0) > 0 || (part.esl ?? 0) > 0;
  return false;
}

/** True for an ideal inductor term γ = 1/L (an inductor without `q`): a short circuit at DC. */
export function hasIdealInductance(part: Part): boolean {
  return part.kind === "L" && part.q === undefined;
}

/**
 * Value at temperature: value·(1 + tempco·1e-6·(T − 25)).
 * @param value - value at 25 °C (SI)
 * @param tempco - ppm/°C (undefined = 0)
 * @param tempC - temperature in °C
 */
export function valueAtTemperature(value: number, tempco: number | undefined, tempC: number): number {
  return tempco === undefined || tempC === 25 ? value : value * (1 + tempco * 1e-6 * (tempC - 25));
}

/**
 * Write the model parameters [g, c, γ, r, l, k] of one part with actual value `value` (SI, already at
 * temperature) into `out` at offset `o`. Branch entries are 0 when the part has no branch.
 */
export function writePartParams(part: Part, value: number, out: Float64Array, o: number): void {
  let g = 0, c = 0, gamma = 0, r = 0, l = 0, k = 0;
  if (part.kind === "R") {
    g = 1 / value;
  } else if (part.kind === "L") {
    if (part.q !== undefined) {
      r = (2 * Math.PI * part.q.at * value) / part.q.value;
      l = value;
    } else {
      gamma = 1 / value;
    }
    if (part.srf !== undefined) {
      const ws = 2 * Math.PI * part.srf;
      c = 1 / (ws * ws * value);
    }
  } else if (hasSeriesBranch(part)) {
    r = part.esr ?? 0;
    l = part.esl ?? 0;
    k = 1 / value;
  } else {
    c = value;
  }
  out[o + PARAM_G] = g;
  out[o + PARAM_C] = c;
  out[o + PARAM_GAMMA] = gamma;
  out[o + PARAM_R] = r;
  out[o + PARAM_L] = l;
  out[o + PARAM_K] = k;
}
