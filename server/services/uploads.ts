/**
 * Uploaded files, once received as text (server/middlewares/receive-upload.ts does the HTTP side: multer in memory,
 * the size limit, UTF-8): a type check that reads the content (JSON vs CSV vs Touchstone) rather than trusting the name
 * or the client's MIME type, and a strict JSON reader that names lines.
 * Every problem becomes an AppError before anything is stored: 413 PAYLOAD_TOO_LARGE naming the limit, or
 * 400 INVALID_FILE with "line N: field: reason" and `fields.file`.
 */
import { AppError } from "../errors";
import { isFormatError } from "../../shared/formats/format-error";
import { fieldPath } from "../../shared/schemas/field-path";
import { findUnpairedSurrogate, UNPAIRED_SURROGATE_MESSAGE } from "../../shared/schemas/well-formed-text";

// VARIABLES //

/** Largest parts table or netlist JSON accepted (bytes). */
export const REVISION_UPLOAD_LIMIT = 1024 * 1024;
/** Largest Touchstone file accepted (bytes). */
export const MEASURED_UPLOAD_LIMIT = 5 * 1024 * 1024;
const MAX_JSON_DEPTH = 64;

// TYPES //

/** A received file, decoded as UTF-8 text (byte-order mark removed). */
export interface UploadedText {
  fileName: string;
  /** lower-case extension without the dot ("csv"), "" when none */
  extension: string;
  text: string;
  bytes: number;
}

export type SniffedKind = "json" | "touchstone" | "csv";

// MAIN //

/**
 * What the content looks like: JSON when the first non-blank character is `{` or `[`; Touchstone when the first
 * line that is neither blank nor a `!` comment is an option line (`# Hz S MA R 50`) or `[Version]`; CSV otherwise.
 */
export function sniffKind(text: string): SniffedKind {
  const trimmed = text.trimStart();
  if (trimmed.startsWith("{") || (trimmed.startsWith("[") && !/^\[version\]/i.test(trimmed))) return "json";
  for (const line of text.split(/\r\n|\n|\r/)) {
    const t = line.trim();
    if (t === "" || t.startsWith("!")) continue;
    if (/^\[version\]/i.test(t)) return "touchstone";
    if (/^#(\s+(hz|khz|mhz|ghz|s|y|z|h|g|db|ma|ri|r\s+[\d.eE+-]+))+\s*(!.*)?$/i.test(t) || t === "#") return "touchstone";
    return "csv";
  }
  return "csv";
}

/** Human name of a sniffed kind, for messages. */
export const KIND_NAME: Record<SniffedKind, string> = { json: "a JSON document", touchstone: "a Touchstone file", csv: "CSV text" };

/** 400 INVALID_FILE with `fields.file`; the message is "line N: field: reason" when both are known. */
export function invalidFile(reason: string, line?: number, field?: string): AppError {
  const message = (line === undefined ? "" : `line ${line}: `) + (field === undefined ? "" : `${field}: `) + reason;
  return new AppError("INVALID_FILE", message, { fields: { file: message } });
}

/** Rethrows a FormatError from the shared readers as INVALID_FILE (other errors unchanged). */
export function fromFormatError(error: unknown): unknown {
  if (isFormatError(error)) return invalidFile(error.reason, error.line, error.field);
  return error;
}

/**
 * Parses JSON and maps every value's path (engine style: `parts[2].value`) to its 1-based line, so that schema
 * and netlist errors can name the line. Syntax errors name the line and column.
 * @throws AppError INVALID_FILE, e.g. "line 4: json: expected ',' or '}' (column 3)"
 */
export function parseJsonWithLines(text: string): { value: unknown; lines: Map<string, number> } {
  const lines = new Map<string, number>();
  const s = new JsonScanner(text, lines);
  s.value("", 0);
  s.ws();
  if (s.i < text.length) throw s.fail("unexpected text after the JSON value");
  let value: unknown;
  try {
    value = JSON.parse(text) as unknown;
  } catch (error) {
    throw invalidFile(`not valid JSON (${(error as Error).message})`, 1, "json");
  }
  // "\ud800" is valid JSON but not Unicode text; MariaDB's JSON columns refuse it.
  const unpaired = findUnpairedSurrogate(value);
  if (unpaired) {
    const path = fieldPath(unpaired);
    throw invalidFile(UNPAIRED_SURROGATE_MESSAGE, lineOf(lines, path) ?? 1, path || "json");
  }
  return { value, lines };
}

/** Line of the nearest enclosing path that was seen (e.g. parts[2] for parts[2].tolerance when that key is absent). */
export function lineOf(lines: Map<string, number>, path: string): number | undefined {
  for (let p = path; ; ) {
    const line = lines.get(p);
    if (line !== undefined) return line;
    if (p === "") return undefined;
    const cut = Math.max(p.lastIndexOf("."), p.lastIndexOf("["));
    p = cut < 0 ? "" : p.slice(0, cut);
  }
}

/** A zod issue path as an engine-style path: ["parts", 2, "value"] → "parts[2].value". */
export const pathText = fieldPath;

// HELPERS //

/** A strict JSON scanner (RFC 8259) that records the line where each value starts and names the line of a syntax error. */
class JsonScanner {
  i = 0;
  line = 1;
  private lineStart = 0;

  constructor(private readonly text: string, private readonly lines: Map<string, number>) {}

  fail(reason: string): AppError {
    return invalidFile(`${reason} (column ${this.i - this.lineStart + 1})`, this.line, "json");
  }

  ws(): void {
    const t = this.text;
    while (this.i < t.length) {
      const c = t[this.i];
      if (c === "\n") {
        this.line++;
        this.lineStart = this.i + 1;
      } else if (c !== " " && c !== "\t" && c !== "\r") break;
      this.i++;
    }
  }

  value(path: string, depth: number): void {
    if (depth > MAX_JSON_DEPTH) throw this.fail(`nested more than ${MAX_JSON_DEPTH} levels deep`);
    this.ws();
    this.lines.set(path, this.line);
    const c = this.text[this.i];
    if (c === "{") return this.object(path, depth);
    if (c === "[") return this.array(path, depth);
    if (c === '"') return void this.string();
    const m = /^(?:-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?|true|false|null)/.exec(this.text.slice(this.i, this.i + 400));
    if (!m) throw this.fail(this.i >= this.text.length ? "the JSON ends too early" : `unexpected ${JSON.stringify(c)}`);
    this.i += m[0].length;
  }

  private object(path: string, depth: number): void {
    this.i++;
    this.ws();
    if (this.text[this.i] === "}") return void this.i++;
    for (;;) {
      this.ws();
      if (this.text[this.i] !== '"') throw this.fail("expected a property name in double quotes");
      const key = this.string();
      this.ws();
      if (this.text[this.i] !== ":") throw this.fail(`expected ':' after "${key}"`);
      this.i++;
      this.value(path ? `${path}.${key}` : key, depth + 1);
      this.ws();
      const c = this.text[this.i++];
      if (c === "}") return;
      if (c !== ",") throw this.back("expected ',' or '}'");
    }
  }

  private array(path: string, depth: number): void {
    this.i++;
    this.ws();
    if (this.text[this.i] === "]") return void this.i++;
    for (let k = 0; ; k++) {
      this.value(`${path}[${k}]`, depth + 1);
      this.ws();
      const c = this.text[this.i++];
      if (c === "]") return;
      if (c !== ",") throw this.back("expected ',' or ']'");
    }
  }

  private back(reason: string): AppError {
    this.i--;
    return this.fail(this.i >= this.text.length ? "the JSON ends too early" : reason);
  }

  private string(): string {
    const t = this.text;
    let out = "";
    this.i++;
    for (;;) {
      if (this.i >= t.length) throw this.fail("a string is not closed");
      const c = t[this.i];
      if (c === '"') break;
      if (c === "\n" || c < " ") throw this.fail("control character inside a string");
      if (c === "\\") {
        const e = t[this.i + 1];
        if (e === "u" && /^[0-9a-fA-F]{4}$/.test(t.slice(this.i + 2, this.i + 6))) {
          out += String.fromCharCode(parseInt(t.slice(this.i + 2, this.i + 6), 16));
          this.i += 6;
          continue;
        }
        const simple: Record<string, string> = { '"': '"', "\\": "\\", "/": "/", b: "\b", f: "\f", n: "\n", r: "\r", t: "\t" };
        if (!(e in simple)) throw this.fail("bad escape in a string");
        out += simple[e];
        this.i += 2;
        continue;
      }
      out += c;
      this.i++;
    }
    this.i++;
    return out;
  }
}
