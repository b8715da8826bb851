/**
 * Internals of the Touchstone reader: option-line settings, the record decoder that turns the
 * number stream of network data into frequencies and S-parameters, and the Y/Z → S conversion.
 * The public API is shared/formats/touchstone.ts.
 */
import { invertComplex, multiplyComplex } from "./complex-matrix";
import { fileError } from "./format-error";

/** Limits of the reader (an upload larger than this is refused with a message saying so). */
export const TOUCHSTONE_LIMITS = { maxPorts: 4, maxFrequencies: 100_001 } as const;

export type Param = "S" | "Y" | "Z";
export type DataFormat = "MA" | "DB" | "RI";
export type MatrixFormat = "full" | "lower" | "upper";

export const UNIT_SCALE: Record<string, number> = { HZ: 1, KHZ: 1e3, MHZ: 1e6, GHZ: 1e9 };
export const FORMAT_PARTS: Record<DataFormat, [string, string]> = {
  MA: ["magnitude", "angle"],
  DB: ["dB", "angle"],
  RI: ["real part", "imaginary part"],
};
/** A Fortran/C style real as Touchstone writes it: 1, -1.5, .5, 2., 1e-3, 1.2E+09. */
const REAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
export const DEG = Math.PI / 180;

/** The settings of an option line. */
export interface OptionLine {
  line: number;
  scale: number;
  param: Param;
  format: DataFormat;
  r: number;
}

/** Turns the number stream of [Network Data] (or v1 data) into frequencies and S. */
export class Decoder {
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
      if (!Number.isFinite(hz)) throw fileError(`out of range (${token} is not a finite frequency in Hz)`, line, "frequency");
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
      // A huge dB value (or magnitude × angle) overflows to ±Infinity: refuse it rather than store a value JSON cannot hold.
      if (!Number.isFinite(re) || !Number.isFinite(im)) {
        throw fileError(`out of range (${String(a)} ${String(b)} is not a finite complex value)`, this.recLine, this.fieldName(1 + 2 * k));
      }
      setEntry(m, P, i, j, re, im);
      if (this.matrix !== "full" && i !== j) setEntry(m, P, j, i, re, im);
    }
    if (param !== "S") this.convertToS();
    for (let t = 0; t < m.length; t++) {
      if (!Number.isFinite(m[t])) throw fileError(`cannot be converted to S at ${String(this.rec[0])} Hz (values out of range)`, this.recLine, `${param} data`);
    }
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
export function pairOrder(P: number, twoPort: string, matrix: MatrixFormat): Array<[number, number]> {
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

export function parseReal(token: string): number | undefined {
  if (!REAL.test(token)) return undefined;
  const v = Number(token);
  return Number.isFinite(v) ? v : undefined;
}
