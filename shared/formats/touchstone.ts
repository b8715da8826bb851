/**
 * Touchstone network-parameter files (.s1p … .s4p), versions 1.1 and 2.0 (IBIS Open Forum,
 * Touchstone File Specification Rev 1.1 and Touchstone File Format Specification Version 2.0):
 * a reader that turns any option-line form (S, Y or Z; DB, MA or RI; Hz … GHz) into power-wave
 * S-parameters on real per-port references, and a v1.1 writer whose output the reader reads back.
 * Pure TypeScript (runs in the browser and in Node); no I/O.
 */
import { FormatError, fileError } from "./format-error";

// VARIABLES //

/** Limits of the reader (an upload larger than this is refused with a message saying so). */
export const TOUCHSTONE_LIMITS = { maxPorts: 4, maxFrequencies: 100_001 } as const;

type Param = "S" | "Y" | "Z";
type DataFormat = "MA" | "DB" | "RI";
type MatrixFormat = "full" | "lower" | "upper";

const UNIT_SCALE: Record<string, number> = { HZ: 1, KHZ: 1e3, MHZ: 1e6, GHZ: 1e9 };
const FORMAT_PARTS: Record<DataFormat, [string, string]> = {
  MA: ["magnitude", "angle"],
  DB: ["dB", "angle"],
  RI: ["real part", "imaginary part"],
};
/** A Fortran/C style real as Touchstone writes it: 1, -1.5, .5, 2., 1e-3, 1.2E+09. */
const REAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const DEG = Math.PI / 180;

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

interface OptionLine {
  line: number;
  scale: number;
  param: Param;
  format: DataFormat;
  r: number;
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
 * S = (z − I)(z + I)⁻¹ = (I − y)(I + y)⁻¹ (Pozar, Microwave Engineering 4th ed., eq. 4.44 for
 * equal references). v1 Y/Z values are already normalized to R; v2 values are in ohm / siemens.
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

/** Line-by-line reader; the state machine for both versions. */
class Reader {
  ended = false;
  private version: "1.1" | "2.0" | undefined;
  private readonly comments: string[] = [];
  private option: OptionLine | undefined;
  private ports: number | undefined;
  private order21 = ""; // v2 [Two-Port Data Order]
  private matrix: MatrixFormat = "full";
  private nFreq = 0; // v2 [Number of Frequencies]
  private nFreqLine = 0;
  private reference: number[] | undefined;
  private refLine = 0;
  private mode: "header" | "reference" | "data" | "skip" | "info" = "header";
  private decoder: Decoder | undefined;
  private versionSeen = false;
  private lastLine = 0;

  constructor(
    private readonly hint: number | undefined,
    private readonly hintFrom: string,
  ) {}

  readLine(raw: string, line: number): void {
    const bang = raw.indexOf("!");
    if (bang >= 0) this.comments.push(raw.slice(bang + 1).trim());
    const content = (bang >= 0 ? raw.slice(0, bang) : raw).trim();
    if (content === "") return;
    this.lastLine = line;
    if (this.version === undefined) this.version = /^\[\s*version\s*\]/i.test(content) ? "2.0" : "1.1";
    if (this.mode === "info") {
      if (/^\[\s*end\s+information\s*\]/i.test(content)) this.mode = "header";
      return;
    }
    if (content.startsWith("#")) {
      if (this.option === undefined) this.option = parseOptionLine(content, line);
      return;
    }
    if (content.startsWith("[")) {
      if (this.version === "1.1") {
        throw fileError(`keyword ${keywordName(content)} in a version 1.1 file ([Version] 2.0 must be the first line)`, line, "keyword");
      }
      this.keyword(content, line);
      return;
    }
    this.dataLine(content, line);
  }

  finish(): TouchstoneData {
    const version = this.version ?? "1.1";
    const dec = this.decoder;
    if (dec === undefined || (dec.count === 0 && !dec.pending)) {
      const where = version === "2.0" ? " after [Network Data]" : "";
      throw fileError(`the file has no network data${where}`, Math.max(1, this.lastLine), "frequency");
    }
    dec.end();
    if (version === "2.0") {
      if (this.mode === "data" || this.mode === "reference") this.checkFreqCount(dec, this.lastLine);
    }
    const P = dec.ports;
    const z0 = this.reference ?? new Array<number>(P).fill(this.option?.r ?? 50);
    return { version, ports: P, freqs: dec.freqArray(), z0, s: dec.sArray(), comments: this.comments };
  }

  private dataLine(content: string, line: number): void {
    const tokens = content.split(/\s+/);
    if (this.mode === "reference") {
      this.referenceTokens(tokens, line);
      return;
    }
    if (this.mode === "skip") return;
    if (this.version === "2.0" && this.mode !== "data") {
      throw fileError(`data outside [Network Data] ("${content.slice(0, 40)}")`, line, "keyword");
    }
    if (this.decoder === undefined) this.startV1(tokens.length, line);
    const dec = this.decoder as Decoder;
    for (const t of tokens) {
      if (!dec.push(t, line)) {
        this.mode = "skip"; // v1 two-port noise block
        return;
      }
    }
  }

  private startV1(firstLineTokens: number, line: number): void {
    const option = this.option;
    if (option === undefined) throw fileError('data before the option line (e.g. "# GHz S MA R 50")', line, "option line");
    let P = this.hint;
    if (P === undefined) {
      if (firstLineTokens === 3) P = 1;
      else if (firstLineTokens === 9) P = 2;
      else throw fileError(`cannot tell the number of ports from ${firstLineTokens} numbers on the first data line; give the file name (.s3p) or the port count`, line, "ports");
    }
    this.decoder = new Decoder(P, pairOrder(P, "21_12", "full"), option, new Array<number>(P).fill(option.r), "1.1");
    this.mode = "data";
  }

  private keyword(content: string, line: number): void {
    const m = /^\[([^\]]*)\]\s*(.*)$/.exec(content);
    if (m === null) throw fileError(`malformed keyword "${content.slice(0, 40)}" (missing "]")`, line, "keyword");
    const name = m[1].trim().toLowerCase().replace(/\s+/g, " ");
    const arg = m[2].trim();
    if (this.mode === "reference") this.endReference(line);
    if (this.mode === "data" && name !== "end" && name !== "noise data") {
      throw fileError(`keyword [${m[1].trim()}] inside [Network Data] (only [Noise Data] or [End] may follow)`, line, "keyword");
    }
    switch (name) {
      case "version":
        if (this.versionSeen || this.option !== undefined || this.ports !== undefined) {
          throw fileError("[Version] must be the first line that is not a comment", line, "[Version]");
        }
        if (arg !== "2.0") throw fileError(`version "${arg}" is not supported (Lotwise reads 1.1 and 2.0)`, line, "[Version]");
        this.versionSeen = true;
        return;
      case "number of ports":
        this.setPorts(arg, line);
        return;
      case "two-port data order":
        if (!/^(12_21|21_12)$/.test(arg)) throw fileError(`must be 12_21 or 21_12 (got "${arg}")`, line, "[Two-Port Data Order]");
        this.order21 = arg;
        return;
      case "number of frequencies":
        this.nFreq = parseCount(arg, line, "[Number of Frequencies]", 1);
        if (this.nFreq > TOUCHSTONE_LIMITS.maxFrequencies) {
          throw fileError(`${this.nFreq} frequencies: at most ${TOUCHSTONE_LIMITS.maxFrequencies} frequency points are supported`, line, "[Number of Frequencies]");
        }
        this.nFreqLine = line;
        return;
      case "number of noise frequencies":
        parseCount(arg, line, "[Number of Noise Frequencies]", 0);
        return;
      case "reference":
        this.startReference(arg, line);
        return;
      case "matrix format": {
        const f = arg.toLowerCase();
        if (f !== "full" && f !== "lower" && f !== "upper") throw fileError(`must be Full, Lower or Upper (got "${arg}")`, line, "[Matrix Format]");
        this.matrix = f;
        return;
      }
      case "mixed-mode order":
        throw fileError("mixed-mode data is not supported (Lotwise reads single-ended S, Y and Z)", line, "[Mixed-Mode Order]");
      case "begin information":
        this.mode = "info";
        return;
      case "network data":
        this.startV2(line);
        return;
      case "noise data":
        this.endNetwork(line);
        this.mode = "skip";
        return;
      case "end":
        this.endNetwork(line);
        this.ended = true;
        return;
      default:
        throw fileError(`unknown keyword [${m[1].trim()}]`, line, "keyword");
    }
  }

  private setPorts(arg: string, line: number): void {
    const P = parseCount(arg, line, "[Number of Ports]", 1);
    if (P > TOUCHSTONE_LIMITS.maxPorts) throw fileError(`${P} ports: at most ${TOUCHSTONE_LIMITS.maxPorts} ports are supported`, line, "[Number of Ports]");
    if (this.hint !== undefined && this.hint !== P) {
      throw fileError(`the file declares ${P} ports but ${this.hint} were expected (${this.hintFrom})`, line, "[Number of Ports]");
    }
    this.ports = P;
  }

  private startReference(arg: string, line: number): void {
    if (this.ports === undefined) throw fileError("[Number of Ports] must come before [Reference]", line, "[Reference]");
    this.reference = [];
    this.refLine = line;
    this.mode = "reference";
    if (arg !== "") this.referenceTokens(arg.split(/\s+/), line);
  }

  private referenceTokens(tokens: string[], line: number): void {
    const ref = this.reference as number[];
    for (const t of tokens) {
      if (ref.length === this.ports) throw fileError(`more than ${this.ports} values ("${t}")`, line, "[Reference]");
      const v = parseReal(t);
      if (v === undefined || !(v > 0)) throw fileError(`not a resistance > 0 ("${t}")`, line, "[Reference]");
      ref.push(v);
    }
    if (ref.length === this.ports) this.mode = "header";
  }

  private endReference(line: number): void {
    const n = (this.reference as number[]).length;
    throw fileError(`needs ${this.ports} values, found ${n} before the next keyword (line ${line})`, this.refLine, "[Reference]");
  }

  private startV2(line: number): void {
    if (this.option === undefined) throw fileError('missing before [Network Data] (e.g. "# GHz S MA R 50")', line, "option line");
    if (this.ports === undefined) throw fileError("missing before [Network Data] (required in version 2.0)", line, "[Number of Ports]");
    if (this.nFreq === 0) throw fileError("missing before [Network Data] (required in version 2.0)", line, "[Number of Frequencies]");
    if (this.ports === 2 && this.order21 === "") throw fileError("missing before [Network Data] (required for 2-port files)", line, "[Two-Port Data Order]");
    if (this.decoder !== undefined) throw fileError("appears twice", line, "[Network Data]");
    const P = this.ports;
    const z0 = this.reference ?? new Array<number>(P).fill(this.option.r);
    this.decoder = new Decoder(P, pairOrder(P, this.order21 || "12_21", this.matrix), this.option, z0, "2.0", this.matrix);
    this.decoder.limit = this.nFreq;
    this.decoder.limitLine = this.nFreqLine;
    this.mode = "data";
  }

  private endNetwork(line: number): void {
    if (this.decoder === undefined) throw fileError("[Network Data] must come before this keyword", line, "keyword");
    if (this.mode !== "data") return;
    this.decoder.end();
    this.checkFreqCount(this.decoder, line);
  }

  private checkFreqCount(dec: Decoder, line: number): void {
    if (dec.count !== this.nFreq) {
      throw fileError(`declares ${this.nFreq} frequencies (line ${this.nFreqLine}) but [Network Data] has ${dec.count}`, line, "[Number of Frequencies]");
    }
  }
}

/** Turns the number stream of [Network Data] (or v1 data) into frequencies and S. */
class Decoder {
  count = 0;
  /** v2: the declared number of frequencies (more records are an error). */
  limit: number = TOUCHSTONE_LIMITS.maxFrequencies;
  limitLine = 0;
  private readonly rec: Float64Array;
  private pos = 0;
  private recLine = 0;
  private lastTokenLine = 0;
  private readonly freqs: number[] = [];
  private readonly s: number[] = [];
  private readonly m: Float64Array; // P×P complex work matrix
  private readonly rootR: Float64Array;

  constructor(
    readonly ports: number,
    private readonly order: Array<[number, number]>,
    private readonly option: OptionLine,
    z0: number[],
    private readonly version: "1.1" | "2.0",
    private readonly matrix: MatrixFormat = "full",
  ) {
    this.rec = new Float64Array(1 + 2 * order.length);
    this.m = new Float64Array(ports * ports * 2);
    this.rootR = Float64Array.from(z0, Math.sqrt);
  }

  get pending(): boolean {
    return this.pos > 0;
  }

  /** Add one token; returns false when a v1 two-port noise block starts (stop reading). */
  push(token: string, line: number): boolean {
    const k = this.pos;
    if (k === 0) {
      const f = parseReal(token);
      if (f === undefined) throw fileError(`not a number ("${token}")`, line, "frequency");
      if (!(f >= 0)) throw fileError(`must be ≥ 0 (got ${token})`, line, "frequency");
      const hz = f * this.option.scale;
      const prev = this.freqs.length > 0 ? this.freqs[this.freqs.length - 1] : -1;
      if (hz <= prev) {
        if (this.version === "1.1" && this.ports === 2) return false;
        throw fileError(`frequencies must be strictly increasing (${token} after ${String(prev / this.option.scale)})`, line, "frequency");
      }
      if (this.count >= this.limit) {
        if (this.version === "2.0") throw fileError(`more data than the ${this.limit} frequencies declared on line ${this.limitLine}`, line, "[Number of Frequencies]");
        throw fileError(`too many frequencies: at most ${TOUCHSTONE_LIMITS.maxFrequencies} frequency points are supported`, line, "frequency");
      }
      this.rec[0] = hz;
      this.recLine = line;
    } else {
      const v = parseReal(token);
      if (v === undefined) throw fileError(`not a number ("${token}")`, line, this.fieldName(k));
      this.rec[k] = v;
    }
    this.lastTokenLine = line;
    this.pos = k + 1;
    if (this.pos === this.rec.length) this.completeRecord();
    return true;
  }

  /** Called at the end of the data: a record cut short is an error. */
  end(): void {
    if (this.pos !== 0) throw fileError("missing: the data ends inside a record", this.lastTokenLine, this.fieldName(this.pos));
  }

  freqArray(): Float64Array {
    return Float64Array.from(this.freqs);
  }

  sArray(): Float64Array {
    return Float64Array.from(this.s);
  }

  private fieldName(k: number): string {
    if (k === 0) return "frequency";
    const [i, j] = this.order[(k - 1) >> 1];
    return `${this.option.param}${i + 1}${j + 1} ${FORMAT_PARTS[this.option.format][(k - 1) & 1]}`;
  }

  private completeRecord(): void {
    const P = this.ports;
    const m = this.m;
    const { format, param } = this.option;
    for (let k = 0; k < this.order.length; k++) {
      const [i, j] = this.order[k];
      const a = this.rec[1 + 2 * k];
      const b = this.rec[2 + 2 * k];
      let re: number;
      let im: number;
      if (format === "RI") {
        re = a;
        im = b;
      } else {
        const mag = format === "MA" ? a : 10 ** (a / 20);
        re = mag * Math.cos(b * DEG);
        im = mag * Math.sin(b * DEG);
      }
      setEntry(m, P, i, j, re, im);
      if (this.matrix !== "full" && i !== j) setEntry(m, P, j, i, re, im);
    }
    if (param !== "S") this.convertToS();
    for (let t = 0; t < m.length; t++) this.s.push(m[t]);
    this.freqs.push(this.rec[0]);
    this.count++;
    this.pos = 0;
  }

  /** m := S from normalized z or y (see parseTouchstone). */
  private convertToS(): void {
    const P = this.ports;
    const m = this.m;
    const isZ = this.option.param === "Z";
    if (this.version === "2.0") {
      for (let i = 0; i < P; i++) {
        for (let j = 0; j < P; j++) {
          const f = isZ ? 1 / (this.rootR[i] * this.rootR[j]) : this.rootR[i] * this.rootR[j];
          m[(i * P + j) * 2] *= f;
          m[(i * P + j) * 2 + 1] *= f;
        }
      }
    }
    // Z: S = (z − I)(z + I)⁻¹;  Y: S = (I − y)(I + y)⁻¹
    const sum = Float64Array.from(m);
    const diff = Float64Array.from(m, (v) => (isZ ? v : -v));
    for (let i = 0; i < P; i++) {
      sum[(i * P + i) * 2] += 1;
      diff[(i * P + i) * 2] += isZ ? -1 : 1;
    }
    const inv = invertComplex(sum, P);
    if (inv === undefined) {
      const what = isZ ? "Z + R" : "Y + 1/R";
      throw fileError(`cannot be converted to S at ${String(this.rec[0])} Hz (${what} is singular)`, this.recLine, `${this.option.param} data`);
    }
    multiplyComplex(diff, inv, P, m);
  }
}

function setEntry(m: Float64Array, P: number, i: number, j: number, re: number, im: number): void {
  m[(i * P + j) * 2] = re;
  m[(i * P + j) * 2 + 1] = im;
}

/** Order of the value pairs in one record: [row, column] zero-based. */
function pairOrder(P: number, twoPort: string, matrix: MatrixFormat): Array<[number, number]> {
  const order: Array<[number, number]> = [];
  if (P === 2 && matrix === "full" && twoPort === "21_12") return [[0, 0], [1, 0], [0, 1], [1, 1]];
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) {
      if ((matrix === "lower" && j > i) || (matrix === "upper" && j < i)) continue;
      order.push([i, j]);
    }
  }
  return order;
}

function parseOptionLine(content: string, line: number): OptionLine {
  const tokens = content.slice(1).trim().split(/\s+/).filter((t) => t !== "");
  let unit: string | undefined;
  let param: string | undefined;
  let format: string | undefined;
  let r: number | undefined;
  const once = (was: string | number | undefined, what: string, token: string) => {
    if (was !== undefined) throw fileError(`${what} given twice ("${token}")`, line, "option line");
  };
  for (let k = 0; k < tokens.length; k++) {
    const t = tokens[k];
    const u = t.toUpperCase();
    if (u in UNIT_SCALE) {
      once(unit, "frequency unit", t);
      unit = u;
    } else if (u === "S" || u === "Y" || u === "Z" || u === "H" || u === "G") {
      once(param, "parameter", t);
      if (u === "H" || u === "G") throw fileError(`${u} parameters are not supported (Lotwise reads S, Y and Z)`, line, "option line");
      param = u;
    } else if (u === "DB" || u === "MA" || u === "RI") {
      once(format, "format", t);
      format = u;
    } else if (u === "R") {
      once(r, "R", t);
      const next = tokens[k + 1];
      const v = next === undefined ? undefined : parseReal(next);
      if (v === undefined) throw fileError(`R must be followed by the reference resistance${next === undefined ? "" : ` (got "${next}")`}`, line, "option line");
      if (!(v > 0)) throw fileError(`reference resistance must be > 0 (got ${next})`, line, "option line");
      r = v;
      k++;
    } else {
      throw fileError(`unknown token "${t}" (expected Hz, kHz, MHz, GHz, S, Y, Z, DB, MA, RI or R n)`, line, "option line");
    }
  }
  return { line, scale: UNIT_SCALE[unit ?? "GHZ"], param: (param ?? "S") as Param, format: (format ?? "MA") as DataFormat, r: r ?? 50 };
}

function parseReal(token: string): number | undefined {
  if (!REAL.test(token)) return undefined;
  const v = Number(token);
  return Number.isFinite(v) ? v : undefined;
}

function parseCount(arg: string, line: number, field: string, min: number): number {
  if (!/^\d+$/.test(arg) || Number(arg) < min) throw fileError(`must be a whole number ≥ ${min} (got "${arg}")`, line, field);
  return Number(arg);
}

function keywordName(content: string): string {
  const end = content.indexOf("]");
  return end < 0 ? content.slice(0, 40) : content.slice(0, end + 1);
}

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

/** Gauss-Jordan inverse of a P×P interleaved complex matrix with partial pivoting; undefined if singular. */
function invertComplex(a: Float64Array, P: number): Float64Array | undefined {
  const w = Float64Array.from(a);
  const inv = new Float64Array(P * P * 2);
  let norm = 0;
  for (let t = 0; t < a.length; t += 2) norm = Math.max(norm, Math.hypot(a[t], a[t + 1]));
  for (let i = 0; i < P; i++) inv[(i * P + i) * 2] = 1;
  for (let c = 0; c < P; c++) {
    let piv = c;
    for (let r = c + 1; r < P; r++) if (cabs(w, r, c, P) > cabs(w, piv, c, P)) piv = r;
    if (!(cabs(w, piv, c, P) > 1e-13 * norm)) return undefined;
    swapRows(w, c, piv, P);
    swapRows(inv, c, piv, P);
    const pr = w[(c * P + c) * 2];
    const pi = w[(c * P + c) * 2 + 1];
    const d = pr * pr + pi * pi;
    const ir = pr / d;
    const ii = -pi / d;
    scaleRow(w, c, ir, ii, P);
    scaleRow(inv, c, ir, ii, P);
    for (let r = 0; r < P; r++) {
      if (r === c) continue;
      const fr = w[(r * P + c) * 2];
      const fi = w[(r * P + c) * 2 + 1];
      subtractRow(w, r, c, fr, fi, P);
      subtractRow(inv, r, c, fr, fi, P);
    }
  }
  return inv;
}

function cabs(m: Float64Array, r: number, c: number, P: number): number {
  return Math.hypot(m[(r * P + c) * 2], m[(r * P + c) * 2 + 1]);
}

function swapRows(m: Float64Array, a: number, b: number, P: number): void {
  if (a === b) return;
  for (let t = 0; t < 2 * P; t++) {
    const x = m[a * P * 2 + t];
    m[a * P * 2 + t] = m[b * P * 2 + t];
    m[b * P * 2 + t] = x;
  }
}

function scaleRow(m: Float64Array, r: number, sr: number, si: number, P: number): void {
  for (let j = 0; j < P; j++) {
    const k = (r * P + j) * 2;
    const re = m[k];
    m[k] = re * sr - m[k + 1] * si;
    m[k + 1] = re * si + m[k + 1] * sr;
  }
}

/** row r −= (fr + j·fi) · row c */
function subtractRow(m: Float64Array, r: number, c: number, fr: number, fi: number, P: number): void {
  for (let j = 0; j < P; j++) {
    const kc = (c * P + j) * 2;
    const kr = (r * P + j) * 2;
    m[kr] -= fr * m[kc] - fi * m[kc + 1];
    m[kr + 1] -= fr * m[kc + 1] + fi * m[kc];
  }
}

/** out := a·b (P×P interleaved complex). */
function multiplyComplex(a: Float64Array, b: Float64Array, P: number, out: Float64Array): void {
  for (let i = 0; i < P; i++) {
    for (let j = 0; j < P; j++) {
      let re = 0;
      let im = 0;
      for (let k = 0; k < P; k++) {
        const ar = a[(i * P + k) * 2];
        const ai = a[(i * P + k) * 2 + 1];
        const br = b[(k * P + j) * 2];
        const bi = b[(k * P + j) * 2 + 1];
        re += ar * br - ai * bi;
        im += ar * bi + ai * br;
      }
      out[(i * P + j) * 2] = re;
      out[(i * P + j) * 2 + 1] = im;
    }
  }
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
