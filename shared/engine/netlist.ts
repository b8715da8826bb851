/**
 * Netlist types of the Lotwise engine (the JSON netlist format, already parsed).
 * All values are SI base units: ohm, H, F, Hz, seconds; temperatures in °C.
 * Node `"gnd"` is ground. The zod schema for the JSON edge is `shared/schemas/netlist.ts`.
 */

/** Kind of a two-terminal part. */
export type PartKind = "R" | "L" | "C";

/** IEC 60063 preferred-number series. */
/** The IEC 60063 series Lotwise snaps to (E3 as the historical coarsest). */
export const E_SERIES_NAMES = ["E3", "E6", "E12", "E24", "E48", "E96", "E192"] as const;
export type ESeriesName = (typeof E_SERIES_NAMES)[number];

/** Name of the ground node. */
export const GROUND_NODE = "gnd";

/** A port: a Norton source/termination with real reference impedance `z0` (ohm) from `node` to ground. */
export interface Port {
  name: string;
  node: string;
  z0: number;
}

/** A two-terminal R, L or C with optional tolerance data and parasitics. */
export interface Part {
  ref: string;
  kind: PartKind;
  nodes: [string, string];
  /** Nominal value in ohm, H or F. */
  value: number;
  /** Fraction, 0.02 = ±2 %; default 0 (exact). */
  tolerance?: number;
  /** normal: tolerance = 3σ, truncated at ±tolerance (default normal). */
  distribution?: "normal" | "uniform";
  /** Absolute tolerance in SI units (e.g. 2.5e-13 F for ±0.25 pF); overrides `tolerance`. */
  toleranceAbs?: number;
  series?: ESeriesName;
  lot?: string;
  /** Inductor Q at frequency `at` (Hz): series loss R = 2π·at·L/Q. */
  q?: { value: number; at: number };
  /** Self-resonant frequency (Hz) of an inductor: parallel C = 1/((2π srf)² L). */
  srf?: number;
  /** Capacitor series resistance (ohm). */
  esr?: number;
  /** Capacitor series inductance (H). */
  esl?: number;
  /** ppm/°C: value(T) = value·(1 + tempco·1e-6·(T − 25)). */
  tempco?: number;
  /** Code of the part's tolerance grade in the team's grade catalogue (for BOM cost); the engine ignores it. */
  grade?: string;
}

/** A filter netlist: at least two ports and the parts between them. */
export interface Netlist {
  ports: Port[];
  parts: Part[];
  name?: string;
}
