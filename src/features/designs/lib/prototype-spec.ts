import type { FilterFamily, LadderSpec, LMatchSpec, ResponseType } from "@shared/engine/synthesis/types";
import { designLMatch, synthesizeLadder } from "@shared/engine/synthesis/index";
import type { Netlist } from "@shared/engine/netlist";
import { parseSi } from "@shared/units";

/** The prototype form as typed (frequencies and impedances with SI prefixes). */
export type PrototypeText = {
  mode: "ladder" | "lmatch";
  family: FilterFamily;
  type: ResponseType;
  order: string;
  cutoff: string;
  low: string;
  high: string;
  rippleDb: string;
  z0: string;
  first: "shunt" | "series";
  sourceR: string;
  loadR: string;
  freq: string;
  form: "lowpass" | "highpass";
};

export const DEFAULT_PROTOTYPE: PrototypeText = {
  mode: "ladder", family: "butterworth", type: "lowpass", order: "5", cutoff: "100M", low: "88M", high: "108M",
  rippleDb: "0.1", z0: "50", first: "shunt", sourceR: "50", loadR: "200", freq: "100M", form: "lowpass",
};

export type PrototypeResult = { ok: true; netlist: Netlist } | { ok: false; field: keyof PrototypeText | null; message: string };

function read(text: string, field: keyof PrototypeText): number {
  try {
    return parseSi(text);
  } catch {
    throw Object.assign(new Error(`Cannot read "${text}"; write e.g. 100M, 1.2G, 50.`), { field });
  }
}

/** Synthesizes the netlist the form describes (in the browser), or says which field is wrong. */
export function synthesizeFromText(t: PrototypeText): PrototypeResult {
  try {
    if (t.mode === "lmatch") {
      const spec: LMatchSpec = { sourceR: read(t.sourceR, "sourceR"), loadR: read(t.loadR, "loadR"), freq: read(t.freq, "freq"), form: t.form };
      return { ok: true, netlist: designLMatch(spec) };
    }
    const band = t.type === "bandpass" || t.type === "bandstop";
    const spec: LadderSpec = {
      family: t.family, type: t.type, order: Number(t.order), z0: read(t.z0, "z0"), first: t.first,
      ...(band ? { low: read(t.low, "low"), high: read(t.high, "high") } : { cutoff: read(t.cutoff, "cutoff") }),
      ...(t.family === "chebyshev" ? { rippleDb: Number(t.rippleDb) } : {}),
    };
    if (!Number.isInteger(spec.order)) return { ok: false, field: "order", message: "Order is a whole number 1–12." };
    return { ok: true, netlist: synthesizeLadder(spec) };
  } catch (error) {
    const field = (error as { field?: keyof PrototypeText; path?: string }).field ?? fieldOfPath((error as { path?: string }).path);
    return { ok: false, field, message: error instanceof Error ? error.message : String(error) };
  }
}

function fieldOfPath(path: string | undefined): keyof PrototypeText | null {
  if (!path) return null;
  const key = path.split(".").pop() as keyof PrototypeText;
  return key in DEFAULT_PROTOTYPE ? key : null;
}
