/**
 * The line-by-line state machine of the Touchstone reader (versions 1.1 and 2.0): comments,
 * option line, v2 keywords, and where the network data starts and ends. Records are decoded by
 * {@link Decoder}. The public API is shared/formats/touchstone.ts.
 */
import type { TouchstoneData } from "./touchstone";
import { fileError } from "./format-error";
import { Decoder, type MatrixFormat, type OptionLine, pairOrder, parseReal, type Param, type DataFormat, TOUCHSTONE_LIMITS, UNIT_SCALE } from "./touchstone-decoder";

/** Line-by-line reader; the state machine for both versions. */
export class Reader {
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

function parseCount(arg: string, line: number, field: string, min: number): number {
  if (!/^\d+$/.test(arg) || Number(arg) < min) throw fileError(`must be a whole number ≥ ${min} (got "${arg}")`, line, field);
  return Number(arg);
}

function keywordName(content: string): string {
  const end = content.indexOf("]");
  return end < 0 ? content.slice(0, 40) : content.slice(0, end + 1);
}
