/**
 * Touchstone network-parameter files (.s1p … .s4p), versions 1.1 and 2.0 (IBIS Open Forum,
 * Touchstone File Specification Rev 1.1 and Touchstone File Format Specification Version 2.0):
 * a reader that turns any option-line form (S, Y or Z; DB, MA or RI; Hz … GHz) into power-wave
 * S-parameters on real per-port references, and a v1.1 writer whose output the reader reads back.
 * Pure TypeScript (runs in the browser and in Node); no I/O.
 */
import { FormatError, fileError } from "./format-error";
import { DEG, FORMAT_PARTS, pairOrder, TOUCHSTONE_LIMITS, UNIT_SCALE, type DataFormat } from "./touchstone-decoder";
import { Reader } from "./touchstone-reader";

export { TOUCHSTONE_LIMITS };

// TYPES //

/** A parsed Touchstone file, always as S-parameters. */
export interface TouchstoneData {
  /** "1.1" for files without a [Version] line, "2.0" for `[Version] 2.0`. */
  version: "1.1" | "2.0";
  ports: number;
  /** Frequencies in Hz, strictly increasing. */
  freqs: Float64Array;
  /** Reference resistance of each port (ohm). */
  z0: number[];
  /** S-parameters, interleaved complex: index ((f*P + i)*P + j)*2 (+1 imag) = S_(i+1)(j+1) at freqs[f]. */
  s: Float64Array;
  /** Text after each `!`, trimmed, in file order. */
  comments: string[];
}

/** Hints for {@link parseTouchstone}. */
export interface TouchstoneParseOptions {
  /** Port count (1–4); wins over the file name. Checked against `[Number of Ports]` in v2. */
  ports?: number;
  /** File name; an extension `.sNp` gives the port count. */
  fileName?: string;
}

/** What {@link writeTouchstone} writes. */
export interface TouchstoneWriteData {
  freqs: Float64Array;
  s: Float64Array;
  ports: number;
  /** Reference resistance of every port (ohm). */
  z0: number;
}

/** Choices for {@link writeTouchstone}. */
export interface TouchstoneWriteOptions {
  /** Number format (default "MA", the Touchstone default). */
  format?: DataFormat;
  /** Frequency unit (default "GHz"). */
  unit?: "Hz" | "MHz" | "GHz";
  /** Comment lines written at the top, each after `! `. */
  comment?: string[];
}

// MAIN //

/**
 * Read a Touchstone 1.1 or 2.0 file.
 *
 * Option line `# <unit> <parameter> <format> R <n>`: tokens in any order, case-insensitive, each
 * optional (defaults GHz, S, MA, R 50). Values are read as a stream of numbers, so records may wrap
 * across lines; `!` starts a comment anywhere. Two-port order is N11 N21 N12 N22 in v1 and as
 * `[Two-Port Data Order]` says in v2; three ports and more are row-major. In v1 a two-port noise
 * block (a frequency not above the previous one) ends the S data and is skipped; in v2
 * `[Noise Data]` and `[Begin Information]` blocks are skipped.
 *
 * Y and Z become S with the reference resistances R_i (Kurokawa power waves, real references):
 * with normalized z = R^(-1/2)·Z·R^(-1/2) and y = R^(1/2)·Y·R^(1/2),
 * S = (z − I)(z + I)⁻¹ = (I − y)(I + y)⁻¹ (Kurokawa, "Power waves and the scattering matrix",
 * IEEE Trans. MTT 1965; Pozar, Microwave Engineering 4th ed., sec. 4.3, for equal references;
 * from memory). v1 Y/Z values are already normalized to R; v2 values are in ohm / siemens.
 *
 * @param text - the whole file
 * @param options - port count or file name (needed for v1 files other than 1- and 2-port)
 * @returns frequencies (Hz), S-parameters, per-port references, comments
 * @throws FormatError INVALID_FILE with `line` (1-based) and `field`, e.g.
 *   `line 7: S21 angle: not a number ("1.2.3")`; H and G parameters, mixed-mode data, more than
 *   4 ports or 100,001 frequencies are refused
 * @example
 * parseTouchstone("# MHz S RI\n100 0.5 0\n", { ports: 1 }).s // → Float64Array [0.5, 0]
 */
export function parseTouchstone(text: string, options: TouchstoneParseOptions = {}): TouchstoneData {
  if (typeof text !== "string") throw new FormatError("INVALID_INPUT", "text must be a string", { field: "text" });
  const reader = new Reader(portHint(options), hintSource(options));
  const lines = text.split(/\r\n|\n|\r/);
  for (let n = 0; n < lines.length && !reader.ended; n++) reader.readLine(lines[n], n + 1);
  return reader.finish();
}

/**
 * Write S-parameters as a Touchstone 1.1 file that {@link parseTouchstone} reads back.
 *
 * Layout: comment lines, the option line (`# GHz S MA R 50`), then one record per frequency; two
 * ports in the v1 order N11 N21 N12 N22 on one line, three and four ports one matrix row per line
 * (at most four pairs per line, Touchstone 1.1). Values carry 12 significant digits (relative
 * rounding ≤ 5e-13), frequencies full precision; angles in degrees in (−180, 180]; a zero
 * magnitude in DB format is written as −6000 dB (1e-300).
 *
 * @param data - frequencies (Hz), S in the engine layout, port count (1–4), common reference z0 (ohm)
 * @param options - format (MA), frequency unit (GHz), comment lines
 * @returns the file text, lines ending in "\n"
 * @throws FormatError INVALID_INPUT naming the bad argument
 * @example
 * writeTouchstone({ freqs: new Float64Array([1e9]), s: new Float64Array([0.5, 0]), ports: 1, z0: 50 })
 * // → "# GHz S MA R 50\n1 0.5 0\n"
 */
export function writeTouchstone(data: TouchstoneWriteData, options: TouchstoneWriteOptions = {}): string {
  const { format, unit, comments } = validateWriteInput(data, options);
  const scale = UNIT_SCALE[unit.toUpperCase()];
  const P = data.ports;
  const out: string[] = comments.map((c) => (c === "" ? "!" : `! ${c}`));
  out.push(`# ${unit} S ${format} R ${String(data.z0)}`);
  const order = pairOrder(P, "21_12", "full");
  const perLine = P <= 2 ? order.length : P;
  for (let f = 0; f < data.freqs.length; f++) {
    let line = String(data.freqs[f] / scale);
    for (let k = 0; k < order.length; k++) {
      if (k > 0 && k % perLine === 0) {
        out.push(line);
        line = " ";
      }
      const [i, j] = order[k];
      const at = ((f * P + i) * P + j) * 2;
      line += ` ${formatPair(data.s[at], data.s[at + 1], format)}`;
    }
    out.push(line);
  }
  return `${out.join("\n")}\n`;
}

// HELPERS //

function portHint(options: TouchstoneParseOptions): number | undefined {
  if (options.ports !== undefined) {
    if (!Number.isInteger(options.ports) || options.ports < 1) {
      throw new FormatError("INVALID_INPUT", `must be a whole number ≥ 1 (got ${String(options.ports)})`, { field: "ports" });
    }
    if (options.ports > TOUCHSTONE_LIMITS.maxPorts) throw fileError(`${options.ports} ports: at most ${TOUCHSTONE_LIMITS.maxPorts} ports are supported`, undefined, "ports");
    return options.ports;
  }
  const m = options.fileName === undefined ? null : /\.s(\d+)p$/i.exec(options.fileName);
  if (m === null) return undefined;
  const P = Number(m[1]);
  if (P < 1 || P > TOUCHSTONE_LIMITS.maxPorts) throw fileError(`${P} ports (file name ${options.fileName}): at most ${TOUCHSTONE_LIMITS.maxPorts} ports are supported`, undefined, "ports");
  return P;
}

function hintSource(options: TouchstoneParseOptions): string {
  return options.ports !== undefined ? "from the ports option" : `from the file name ${String(options.fileName)}`;
}

function validateWriteInput(data: TouchstoneWriteData, options: TouchstoneWriteOptions): { format: DataFormat; unit: "Hz" | "MHz" | "GHz"; comments: string[] } {
  const bad = (field: string, reason: string) => new FormatError("INVALID_INPUT", reason, { field });
  const P = data.ports;
  if (!Number.isInteger(P) || P < 1 || P > TOUCHSTONE_LIMITS.maxPorts) throw bad("ports", `must be a whole number from 1 to ${TOUCHSTONE_LIMITS.maxPorts} (got ${String(P)})`);
  if (!(data.freqs instanceof Float64Array) || data.freqs.length === 0) throw bad("freqs", "must be a non-empty Float64Array");
  for (let f = 0; f < data.freqs.length; f++) {
    const v = data.freqs[f];
    if (!Number.isFinite(v) || v < 0 || (f > 0 && !(v > data.freqs[f - 1]))) throw bad("freqs", `must be finite, ≥ 0 and strictly increasing (freqs[${f}] = ${v})`);
  }
  if (!(data.s instanceof Float64Array) || data.s.length !== data.freqs.length * P * P * 2) {
    throw bad("s", `must be a Float64Array of length freqs.length·ports²·2 = ${data.freqs.length * P * P * 2}`);
  }
  for (let t = 0; t < data.s.length; t++) if (!Number.isFinite(data.s[t])) throw bad("s", `s[${t}] is not finite`);
  if (!Number.isFinite(data.z0) || !(data.z0 > 0)) throw bad("z0", `must be a finite resistance > 0 (got ${String(data.z0)})`);
  const format = options.format ?? "MA";
  if (!(format in FORMAT_PARTS)) throw bad("format", `must be MA, DB or RI (got ${String(format)})`);
  const unit = options.unit ?? "GHz";
  if (unit !== "Hz" && unit !== "MHz" && unit !== "GHz") throw bad("unit", `must be Hz, MHz or GHz (got ${String(unit)})`);
  const comments = (options.comment ?? []).flatMap((c) => String(c).split(/\r\n|\n|\r/)).map((c) => c.trim());
  return { format, unit, comments };
}

function formatPair(re: number, im: number, format: DataFormat): string {
  if (format === "RI") return `${num(re)} ${num(im)}`;
  const mag = Math.hypot(re, im);
  let deg = Math.atan2(im, re) / DEG;
  if (deg <= -180) deg += 360;
  const first = format === "MA" ? mag : 20 * Math.log10(Math.max(mag, 1e-300));
  return `${num(first)} ${num(deg)}`;
}

/** 12 significant digits, shortest form ("0.5", "1.23456789012e-7"). */
function num(x: number): string {
  return String(Number(x.toPrecision(12)));
}
