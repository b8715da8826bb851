/** Input and result types of the Lotwise synthesis helpers (re-exported by ./index). */

/** Approximation family of an all-pole ladder. */
export type FilterFamily = "butterworth" | "chebyshev" | "bessel";

/** Frequency response type produced from the low-pass prototype. */
export type ResponseType = "lowpass" | "highpass" | "bandpass" | "bandstop";

/** What {@link synthesizeLadder} builds. Frequencies in Hz, impedance in ohm. */
export interface LadderSpec {
  family: FilterFamily;
  type: ResponseType;
  /** Number of reactive positions of the prototype, integer 1..12. */
  order: number;
  /**
   * Cutoff (Hz) for lowpass/highpass. Butterworth and Bessel: the −3 dB frequency.
   * Chebyshev: the ripple band edge (loss = rippleDb there), not the 3 dB point.
   */
  cutoff?: number;
  /** Lower band edge (Hz) for bandpass/bandstop; same meaning per family as `cutoff`. */
  low?: number;
  /** Upper band edge (Hz) for bandpass/bandstop. */
  high?: number;
  /** Chebyshev pass-band ripple in dB, 0.001..6; required for chebyshev, ignored otherwise. */
  rippleDb?: number;
  /** Source (port "in") reference impedance in ohm, default 50. */
  z0?: number;
  /** Position 1 (next to the source) is a shunt arm ("shunt", default) or a series arm ("series", the dual). */
  first?: "shunt" | "series";
}

/** Normalized prototype (g0 = 1 ohm source, ωc = 1 rad/s). */
export interface PrototypeValues {
  /** g1..gn (g[0] = g1). */
  g: number[];
  /** g(n+1): a resistance when gn is a shunt C, a conductance when gn is a series L. */
  load: number;
  /** −3 dB angular frequency (rad/s) of this normalized prototype. */
  w3dB: number;
}

/** What {@link designLMatch} builds. */
export interface LMatchSpec {
  /** Source resistance (ohm); port 1. */
  sourceR: number;
  /** Load resistance (ohm); port 2. */
  loadR: number;
  /** Match frequency (Hz). */
  freq: number;
  /** "lowpass" (series L, shunt C; default) or "highpass" (series C, shunt L). */
  form?: "lowpass" | "highpass";
}
