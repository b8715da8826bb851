/**
 * Ladder synthesis: normalized prototype → impedance scaling → frequency transform → Lotwise netlist.
 */
import { EngineError } from "../errors";
import { GROUND_NODE, type Netlist, type Part } from "../netlist";
import { prototypeValues, validatePrototypeInput } from "./prototypes";
import type { LadderSpec, ResponseType } from "./types";

const TYPES: readonly ResponseType[] = ["lowpass", "highpass", "bandpass", "bandstop"];

/**
 * Doubly terminated all-pole LC ladder as a netlist.
 *
 * Scaling and transforms (Pozar, Microwave Engineering 4th ed., sec. 8.4), R0 = z0, ω in rad/s:
 * | prototype | low-pass | high-pass | band-pass (ω0 = √(ω1ω2), Δ = (ω2−ω1)/ω0) | band-stop |
 * |---|---|---|---|---|
 * | series gk | L = R0 gk/ωc | C = 1/(R0 ωc gk) | series L = R0 gk/(ω0Δ) + C = Δ/(ω0 R0 gk) | parallel L = R0 Δ gk/ω0, C = 1/(ω0 Δ R0 gk) |
 * | shunt gk | C = gk/(R0 ωc) | L = R0/(ωc gk) | parallel L = R0 Δ/(ω0 gk), C = gk/(ω0 Δ R0) | series L = R0/(ω0 Δ gk) + C = Δ gk/(ω0 R0) |
 *
 * - `cutoff` (or `low`/`high`): Butterworth and Bessel put the −3 dB point there (Bessel uses g·w3dB);
 *   **Chebyshev puts the ripple band edge there** (loss = rippleDb, not 3 dB).
 * - Terminations: port "in" z0 = R0. g(n+1) is a resistance when the last arm is a shunt C-type arm
 *   and a conductance when it is a series L-type arm, so port "out" z0 = R0·g(n+1) (last arm shunt) or
 *   R0/g(n+1) (last arm series). The dual (series-first) form swaps impedance and admittance of every
 *   prototype arm, and hence also of the load: the same rule, applied to whichever arm ends up last,
 *   covers both forms (for even-order Chebyshev, shunt-first gives R0/g(n+1), series-first R0·g(n+1)).
 * - Topology: position k (1 = next to the source) is a shunt arm for odd k when `first` = "shunt",
 *   for even k when "series". Nodes are named n1 (port "in"), n2, … in order along the ladder, ground
 *   is "gnd". Refs: kind letter + position (C1, L2, …); a resonator arm (band-pass/band-stop) holds
 *   both an L and a C with the same position number (L2 and C2). Tolerances are left unset.
 *
 * @param spec family, type, order, cutoff or low/high (Hz), rippleDb (chebyshev), z0 (default 50 ohm), first (default "shunt")
 * @returns netlist with ports [in, out] and a descriptive `name`
 * @throws EngineError INVALID_INPUT naming the bad parameter
 * @example synthesizeLadder({ family: "butterworth", type: "lowpass", order: 3, cutoff: 100e6 }).parts.map((p) => p.value)
 * // returns ≈ [3.1831e-11, 1.59155e-7, 3.1831e-11]  (C1, L2, C3)
 */
export function synthesizeLadder(spec: LadderSpec): Netlist {
  const input = validateLadderInput(spec);
  const proto = prototypeValues(spec.family, spec.order, spec.rippleDb);
  const freqScale = spec.family === "bessel" ? proto.w3dB : 1;
  const g = proto.g.map((v) => v * freqScale);
  const { r0, shuntFirst } = input;
  const parts: Part[] = [];
  let nodeCount = 1;
  const newNode = () => `n${++nodeCount}`;
  let main = "n1";
  for (let k = 1; k <= g.length; k++) {
    const shunt = (k % 2 === 1) === shuntFirst;
    const arm = armValues(input, g[k - 1], shunt);
    if (arm.kind === "series") {
      // L then C in series; the node between them is numbered before the arm's far end
      const mid = newNode();
      const end = shunt ? GROUND_NODE : newNode();
      parts.push(part("L", k, main, mid, arm.l), part("C", k, mid, end, arm.c));
      if (!shunt) main = end;
      continue;
    }
    const end = shunt ? GROUND_NODE : newNode();
    if (arm.kind === "single") parts.push(part(arm.part.kind, k, main, end, arm.part.value));
    else parts.push(part("L", k, main, end, arm.l), part("C", k, main, end, arm.c));
    if (!shunt) main = end;
  }
  const lastShunt = (g.length % 2 === 1) === shuntFirst;
  const loadZ0 = lastShunt ? r0 * proto.load : r0 / proto.load;
  return {
    name: describeLadder(spec),
    ports: [
      { name: "in", node: "n1", z0: r0 },
      { name: "out", node: main, z0: loadZ0 },
    ],
    parts,
  };
}

interface LadderInput {
  r0: number;
  shuntFirst: boolean;
  type: ResponseType;
  /** ωc for low/high-pass, ω0 for band types (rad/s). */
  omega: number;
  /** Fractional bandwidth Δ (band types only). */
  delta: number;
}

type Arm =
  | { kind: "single"; part: { kind: "L" | "C"; value: number } }
  | { kind: "parallel"; l: number; c: number }
  | { kind: "series"; l: number; c: number };

/** Element values of prototype position with value gk (already frequency-scaled) per the table above. */
function armValues(input: LadderInput, gk: number, shunt: boolean): Arm {
  const { r0, omega: w, delta: d } = input;
  switch (input.type) {
    case "lowpass":
      return { kind: "single", part: shunt ? { kind: "C", value: gk / (r0 * w) } : { kind: "L", value: (r0 * gk) / w } };
    case "highpass":
      return { kind: "single", part: shunt ? { kind: "L", value: r0 / (w * gk) } : { kind: "C", value: 1 / (r0 * w * gk) } };
    case "bandpass":
      return shunt
        ? { kind: "parallel", l: (r0 * d) / (w * gk), c: gk / (w * d * r0) }
        : { kind: "series", l: (r0 * gk) / (w * d), c: d / (w * r0 * gk) };
    case "bandstop":
      return shunt
        ? { kind: "series", l: r0 / (w * d * gk), c: (d * gk) / (w * r0) }
        : { kind: "parallel", l: (r0 * d * gk) / w, c: 1 / (w * d * r0 * gk) };
  }
}

function part(kind: "L" | "C", position: number, a: string, b: string, value: number): Part {
  return { ref: `${kind}${position}`, kind, nodes: [a, b], value };
}

/** Guard checks; messages name the parameter. */
function validateLadderInput(spec: LadderSpec): LadderInput {
  if (spec === null || typeof spec !== "object") throw new EngineError("INVALID_INPUT", "spec must be an object");
  validatePrototypeInput(spec.family, spec.order, spec.rippleDb);
  if (!TYPES.includes(spec.type)) {
    throw new EngineError("INVALID_INPUT", `type must be one of ${TYPES.join(", ")} (got ${String(spec.type)})`, {
      path: "type",
    });
  }
  const z0 = spec.z0 ?? 50;
  if (typeof z0 !== "number" || !Number.isFinite(z0) || z0 <= 0) {
    throw new EngineError("INVALID_INPUT", `z0 must be a finite positive resistance in ohm (got ${String(spec.z0)})`, {
      path: "z0",
    });
  }
  const first = spec.first ?? "shunt";
  if (first !== "shunt" && first !== "series") {
    throw new EngineError("INVALID_INPUT", `first must be "shunt" or "series" (got ${String(spec.first)})`, {
      path: "first",
    });
  }
  const base = { r0: z0, shuntFirst: first === "shunt", type: spec.type };
  if (spec.type === "lowpass" || spec.type === "highpass") {
    const fc = requirePositiveHz(spec.cutoff, "cutoff", spec.type);
    return { ...base, omega: 2 * Math.PI * fc, delta: 0 };
  }
  const low = requirePositiveHz(spec.low, "low", spec.type);
  const high = requirePositiveHz(spec.high, "high", spec.type);
  if (!(low < high)) {
    throw new EngineError("INVALID_INPUT", `low must be below high (got low ${low} Hz, high ${high} Hz)`, { path: "low" });
  }
  const w1 = 2 * Math.PI * low;
  const w2 = 2 * Math.PI * high;
  const w0 = Math.sqrt(w1 * w2);
  return { ...base, omega: w0, delta: (w2 - w1) / w0 };
}

function requirePositiveHz(value: unknown, name: string, type: ResponseType): number {
  if (value === undefined) {
    throw new EngineError("INVALID_INPUT", `${name} (Hz) is required for a ${type} filter`, { path: name });
  }
  if (typeof value !== "number" || !Number.isFinite(value) || value <= 0) {
    throw new EngineError("INVALID_INPUT", `${name} must be a finite frequency above 0 Hz (got ${String(value)})`, {
      path: name,
    });
  }
  return value;
}

const TYPE_LABEL: Record<ResponseType, string> = {
  lowpass: "low-pass",
  highpass: "high-pass",
  bandpass: "band-pass",
  bandstop: "band-stop",
};

function describeLadder(spec: LadderSpec): string {
  const family = spec.family.charAt(0).toUpperCase() + spec.family.slice(1);
  const ripple = spec.family === "chebyshev" ? ` ${spec.rippleDb} dB` : "";
  const band =
    spec.type === "lowpass" || spec.type === "highpass"
      ? formatHz(spec.cutoff as number)
      : `${formatHz(spec.low as number)} to ${formatHz(spec.high as number)}`;
  return `${family}${ripple} ${TYPE_LABEL[spec.type]}, n=${spec.order}, ${band}`;
}

/** 2e9 → "2 GHz", 1.5e6 → "1.5 MHz" (up to 4 significant digits). */
export function formatHz(hz: number): string {
  const prefixes: [number, string][] = [
    [1e9, "G"],
    [1e6, "M"],
    [1e3, "k"],
  ];
  for (const [scale, prefix] of prefixes) {
    if (hz >= scale) return `${Number((hz / scale).toPrecision(4))} ${prefix}Hz`;
  }
  return `${Number(hz.toPrecision(4))} Hz`;
}
