/**
 * The Lotwise parts table as CSV (our own columns, documented below), read and written.
 *
 * Columns (header row required, any order, names case-insensitive; ref, kind, node1, node2 and
 * value required, every other cell may be empty):
 *
 * | column        | meaning                                           | example            |
 * | ------------- | ------------------------------------------------- | ------------------ |
 * | ref           | reference designator (letters, digits, _ . -)     | `L2`               |
 * | kind          | R, L or C                                         | `C`                |
 * | node1, node2  | the two nodes (`gnd` is ground)                   | `n1`, `gnd`        |
 * | value         | nominal, SI prefix and unit optional              | `33p`, `4.7 nH`    |
 * | tolerance     | `2%`, `0.02` or an IEC 60062 letter (see below)   | `J`                |
 * | distribution  | normal (tolerance = 3σ) or uniform                | `uniform`          |
 * | tolerance_abs | absolute tolerance, overrides tolerance           | `0.25p`            |
 * | series        | E3 … E192                                         | `E24`              |
 * | lot           | lot name (parts of one lot drift together)        | `reel-7`           |
 * | q, q_at       | inductor Q and the frequency it is given at       | `45`, `250 MHz`    |
 * | srf           | inductor self-resonant frequency                  | `2.4G`             |
 * | esr, esl      | capacitor series resistance and inductance        | `0.2`, `0.5 nH`    |
 * | tempco        | ppm/°C (a trailing "ppm" or "ppm/°C" is allowed)  | `-30`              |
 * | grade         | the part's grade code in the grade catalogue      | `G`                |
 *
 * Letter codes (IEC 60062:2016): F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 %. B, C, D are ±0.1, ±0.25,
 * ±0.5 pF absolute on a capacitor and ±0.1, ±0.25, ±0.5 % on a resistor; on an inductor they are
 * refused as ambiguous. IEC 60062 meant the pF reading for small rated values (about 10 pF and
 * below), so a capacitor above 10 pF with B/C/D gets a warning.
 *
 * CSV per RFC 4180: quoted fields with commas, line breaks and doubled quotes; CRLF or LF; a UTF-8
 * byte-order mark; blank lines and lines starting with `#` are skipped; spaces around unquoted cells
 * are ignored (quoted cells are kept as written). Ports are not part of it.
 */
import { readTolerance as readToleranceText } from "../tolerance";
import type { ESeriesName, Part, PartKind } from "../engine/netlist";
import { formatSi, parseSi } from "../units";
import { FormatError, fileError } from "./format-error";

// VARIABLES //

/** Limits of the reader, matching the netlist schema (shared/schemas/netlist.ts). */
export const PARTS_CSV_LIMITS = { maxParts: 500, maxRefLength: 32, maxNodeLength: 64, maxLotLength: 32, maxGradeLength: 40, maxTolerance: 0.5 } as const;

/** Every column, in the order {@link writePartsCsv} writes them. */
export const PARTS_CSV_COLUMNS = [
  "ref", "kind", "node1", "node2", "value", "tolerance", "distribution", "tolerance_abs",
  "series", "lot", "q", "q_at", "srf", "esr", "esl", "tempco", "grade",
] as const;

export type PartsCsvColumn = (typeof PARTS_CSV_COLUMNS)[number];

const REQUIRED: readonly PartsCsvColumn[] = ["ref", "kind", "node1", "node2", "value"];
const SERIES: readonly ESeriesName[] = ["E3", "E6", "E12", "E24", "E48", "E96", "E192"];
const PLAIN_NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

// TYPES //

/** Result of {@link parsePartsCsv}. */
export interface PartsCsvResult {
  parts: Part[];
  /** Doubtful but legal cells, each "line N: column: …" (e.g. a B/C/D code on a 100 pF capacitor). */
  warnings: string[];
}

interface CsvRecord {
  line: number;
  fields: string[];
}

// MAIN //

/**
 * Read a parts table.
 *
 * @param text - the CSV text (see the module comment for the columns)
 * @returns the parts in file order (optional fields only where a cell was filled) and warnings
 * @throws FormatError INVALID_FILE with `line` (1-based, the header is line 1 when it is the first
 *   line) and `field` (the column name), e.g. `line 4: value: not a number with an SI prefix ("4.7x")`;
 *   more than 500 parts are refused
 * @example
 * parsePartsCsv("ref,kind,node1,node2,value,tolerance\nC1,C,n1,gnd,33p,J\n").parts
 * // → [{ ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 3.3e-11, tolerance: 0.05 }]
 */
export function parsePartsCsv(text: string): PartsCsvResult {
  if (typeof text !== "string") throw new FormatError("INVALID_INPUT", "text must be a string", { field: "text" });
  const records = splitCsv(text.charCodeAt(0) === 0xfeff ? text.slice(1) : text);
  if (records.length === 0) throw fileError("the file is empty (a header row is required: ref,kind,node1,node2,value,…)", 1, "header");
  const columns = readHeader(records[0]);
  if (records.length === 1) throw fileError("the file has a header but no parts", records[0].line, "header");
  const parts: Part[] = [];
  const warnings: string[] = [];
  const seen = new Map<string, number>();
  for (let r = 1; r < records.length; r++) {
    const rec = records[r];
    if (parts.length === PARTS_CSV_LIMITS.maxParts) {
      throw fileError(`too many parts: at most ${PARTS_CSV_LIMITS.maxParts} parts are supported`, rec.line, "ref");
    }
    if (rec.fields.length !== columns.length) {
      throw fileError(`${rec.fields.length} fields but the header has ${columns.length} columns`, rec.line, "row");
    }
    const cells = new Map<PartsCsvColumn, string>();
    columns.forEach((c, k) => cells.set(c, rec.fields[k]));
    const part = readPart(cells, rec.line, warnings);
    const first = seen.get(part.ref);
    if (first !== undefined) throw fileError(`duplicate ref "${part.ref}" (first on line ${first})`, rec.line, "ref");
    seen.set(part.ref, rec.line);
    parts.push(part);
  }
  return { parts, warnings };
}

/**
 * Write parts as CSV that {@link parsePartsCsv} reads back to equal parts.
 *
 * All seventeen columns are written, in {@link PARTS_CSV_COLUMNS} order, with CRLF line ends
 * (RFC 4180). Values use an SI prefix when that reads back exactly ("4.7n", "33p"), otherwise the
 * shortest exact decimal; tolerances are fractions ("0.05"). Cells with a comma, quote, line break
 * or outer spaces are quoted.
 *
 * @param parts - parts as in a netlist
 * @returns the CSV text
 * @throws FormatError INVALID_INPUT when a part has no ref or a non-finite number
 * @example
 * writePartsCsv([{ ref: "R1", kind: "R", nodes: ["a", "b"], value: 4700 }])
 * // → "ref,kind,node1,…,tempco\r\nR1,R,a,b,4.7k,,,,,,,,,,,\r\n"
 */
export function writePartsCsv(parts: Part[]): string {
  if (!Array.isArray(parts)) throw new FormatError("INVALID_INPUT", "parts must be an array", { field: "parts" });
  const rows = [PARTS_CSV_COLUMNS.join(",")];
  parts.forEach((p, k) => {
    if (typeof p?.ref !== "string" || p.ref === "") throw new FormatError("INVALID_INPUT", `parts[${k}] has no ref`, { field: "ref" });
    const cells: Record<PartsCsvColumn, string> = {
      ref: p.ref, kind: p.kind, node1: p.nodes[0], node2: p.nodes[1], value: si(p.value, k, "value"),
      tolerance: p.tolerance === undefined ? "" : plain(p.tolerance, k, "tolerance"),
      distribution: p.distribution ?? "",
      tolerance_abs: p.toleranceAbs === undefined ? "" : si(p.toleranceAbs, k, "tolerance_abs"),
      series: p.series ?? "", lot: p.lot ?? "",
      q: p.q === undefined ? "" : plain(p.q.value, k, "q"),
      q_at: p.q === undefined ? "" : si(p.q.at, k, "q_at"),
      srf: p.srf === undefined ? "" : si(p.srf, k, "srf"),
      esr: p.esr === undefined ? "" : si(p.esr, k, "esr"),
      esl: p.esl === undefined ? "" : si(p.esl, k, "esl"),
      tempco: p.tempco === undefined ? "" : plain(p.tempco, k, "tempco"),
      grade: p.grade ?? "",
    };
    rows.push(PARTS_CSV_COLUMNS.map((c) => quote(cells[c])).join(","));
  });
  return `${rows.join("\r\n")}\r\n`;
}

// HELPERS //

function readHeader(rec: CsvRecord): PartsCsvColumn[] {
  const names = rec.fields.map((f) => f.trim().toLowerCase());
  const known = new Set<string>(PARTS_CSV_COLUMNS);
  const unknown = names.filter((n) => !known.has(n));
  if (unknown.length > 0) {
    const list = unknown.map((n) => (n === "" ? '""' : `"${n}"`)).join(", ");
    throw fileError(`unknown column${unknown.length > 1 ? "s" : ""} ${list} (known: ${PARTS_CSV_COLUMNS.join(", ")})`, rec.line, "header");
  }
  const dup = names.find((n, k) => names.indexOf(n) !== k);
  if (dup !== undefined) throw fileError(`column "${dup}" appears twice`, rec.line, "header");
  const missing = REQUIRED.filter((c) => !names.includes(c));
  if (missing.length > 0) throw fileError(`missing required column${missing.length > 1 ? "s" : ""} ${missing.join(", ")}`, rec.line, "header");
  return names as PartsCsvColumn[];
}

function readPart(cells: Map<PartsCsvColumn, string>, line: number, warnings: string[]): Part {
  const cell = (c: PartsCsvColumn) => cells.get(c) ?? "";
  const fail = (c: PartsCsvColumn, reason: string) => fileError(reason, line, c);
  const ref = cell("ref");
  if (ref === "") throw fail("ref", "required");
  if (ref.length > PARTS_CSV_LIMITS.maxRefLength || !/^[A-Za-z0-9_.-]+$/.test(ref)) {
    throw fail("ref", `"${ref}" must be 1–${PARTS_CSV_LIMITS.maxRefLength} letters, digits, _ . -`);
  }
  const kindText = cell("kind").toUpperCase();
  if (kindText !== "R" && kindText !== "L" && kindText !== "C") throw fail("kind", `must be R, L or C (got "${cell("kind")}")`);
  const kind: PartKind = kindText;
  const nodes = [node(cell("node1"), line, "node1"), node(cell("node2"), line, "node2")] as [string, string];
  if (nodes[0] === nodes[1]) throw fail("node2", `same node as node1 ("${nodes[0]}")`);
  const value = siCell(cell("value"), line, "value", "positive");
  const part: Part = { ref, kind, nodes, value };
  readTolerance(part, cells, line, warnings);
  const dist = cell("distribution").toLowerCase();
  if (dist !== "") {
    if (dist !== "normal" && dist !== "uniform") throw fail("distribution", `must be normal or uniform (got "${cell("distribution")}")`);
    part.distribution = dist;
  }
  const series = cell("series").toUpperCase();
  if (series !== "") {
    if (!(SERIES as readonly string[]).includes(series)) throw fail("series", `must be one of ${SERIES.join(", ")} (got "${cell("series")}")`);
    part.series = series as ESeriesName;
  }
  const lot = cell("lot");
  if (lot.length > PARTS_CSV_LIMITS.maxLotLength) throw fail("lot", `at most ${PARTS_CSV_LIMITS.maxLotLength} characters`);
  if (lot !== "") part.lot = lot;
  readParasitics(part, cells, line);
  const tempco = cell("tempco").replace(/\s*ppm(\s*\/\s*°?\s*C)?$/i, "");
  if (tempco !== "") part.tempco = plainCell(tempco, line, "tempco");
  const grade = cell("grade");
  if (grade.length > PARTS_CSV_LIMITS.maxGradeLength) throw fail("grade", `at most ${PARTS_CSV_LIMITS.maxGradeLength} characters`);
  if (grade !== "") part.grade = grade;
  return part;
}

function readTolerance(part: Part, cells: Map<PartsCsvColumn, string>, line: number, warnings: string[]): void {
  const raw = cells.get("tolerance") ?? "";
  const abs = cells.get("tolerance_abs") ?? "";
  if (abs !== "") part.toleranceAbs = siCell(abs, line, "tolerance_abs", "nonNegative");
  if (raw === "") return;
  // The one tolerance reader (shared/tolerance.ts), as in the parts table, the grade form and the command line.
  const r = readToleranceText(raw, part.kind, part.value);
  if (!r.ok) throw fileError(r.error, line, "tolerance");
  if (r.value.toleranceAbs !== undefined) {
    if (abs !== "") throw fileError(`"${raw}" is an absolute tolerance and tolerance_abs is also given`, line, "tolerance");
    part.toleranceAbs = r.value.toleranceAbs;
  }
  if (r.value.tolerance !== undefined) part.tolerance = r.value.tolerance;
  if (r.warning) warnings.push(`line ${line}: tolerance: ${r.warning}`);
}

function readParasitics(part: Part, cells: Map<PartsCsvColumn, string>, line: number): void {
  const cell = (c: PartsCsvColumn) => cells.get(c) ?? "";
  const only = (c: PartsCsvColumn, kind: PartKind, what: string) => {
    if (part.kind !== kind) throw fileError(`applies only to ${what} (${part.ref} is ${part.kind})`, line, c);
  };
  const q = cell("q");
  const qAt = cell("q_at");
  if (q !== "" || qAt !== "") {
    only(q !== "" ? "q" : "q_at", "L", "inductors");
    if (q === "") throw fileError("q_at is given without q", line, "q");
    if (qAt === "") throw fileError("q is given without q_at (the frequency the Q is specified at)", line, "q_at");
    const value = plainCell(q, line, "q");
    if (!(value > 0)) throw fileError(`must be > 0 (got "${q}")`, line, "q");
    part.q = { value, at: siCell(qAt, line, "q_at", "positive") };
  }
  if (cell("srf") !== "") {
    only("srf", "L", "inductors");
    part.srf = siCell(cell("srf"), line, "srf", "positive");
  }
  for (const c of ["esr", "esl"] as const) {
    if (cell(c) === "") continue;
    only(c, "C", "capacitors");
    part[c] = siCell(cell(c), line, c, "nonNegative");
  }
}

function node(text: string, line: number, field: PartsCsvColumn): string {
  if (text === "") throw fileError("required", line, field);
  if (text.length > PARTS_CSV_LIMITS.maxNodeLength) throw fileError(`at most ${PARTS_CSV_LIMITS.maxNodeLength} characters`, line, field);
  return text;
}

function siCell(text: string, line: number, field: PartsCsvColumn, sign: "positive" | "nonNegative"): number {
  let v: number;
  try {
    v = parseSi(text);
  } catch {
    throw fileError(`not a number with an SI prefix ("${text}")`, line, field);
  }
  if (!Number.isFinite(v)) throw fileError(`not a finite number ("${text}")`, line, field);
  if (sign === "positive" ? !(v > 0) : !(v >= 0)) throw fileError(`must be ${sign === "positive" ? "> 0" : "≥ 0"} (got "${text}")`, line, field);
  return v;
}

function plainCell(text: string, line: number, field: PartsCsvColumn): number {
  const v = PLAIN_NUMBER.test(text) ? Number(text) : NaN;
  if (!Number.isFinite(v)) throw fileError(`not a number ("${text}")`, line, field);
  return v;
}

/**
 * Split CSV text into records (RFC 4180), skipping blank lines and `#` comment lines; each record
 * carries the 1-based line it starts on. Spaces around an unquoted field are dropped; a quoted
 * field is kept as written.
 */
function splitCsv(text: string): CsvRecord[] {
  const records: CsvRecord[] = [];
  const n = text.length;
  let i = 0;
  let line = 1;
  while (i < n) {
    const start = line;
    let lineEnd = i;
    while (lineEnd < n && text[lineEnd] !== "\n" && text[lineEnd] !== "\r") lineEnd++;
    const head = text.slice(i, lineEnd).trim();
    if (head === "" || head.startsWith("#")) {
      i = skipNewline(text, lineEnd);
      line++;
      continue;
    }
    const fields: string[] = [];
    let field = "";
    for (;;) {
      const ch = text[i];
      if (ch === '"' && field.trim() === "") {
        field = "";
        i++;
        for (;;) {
          if (i >= n) throw fileError("a quoted field is not closed (missing \")", start, "row");
          const q = text[i];
          if (q === '"') {
            if (text[i + 1] === '"') {
              field += '"';
              i += 2;
              continue;
            }
            i++;
            break;
          }
          if (q === "\r" || q === "\n") {
            line++;
            if (q === "\r" && text[i + 1] === "\n") {
              field += "\r";
              i++;
            }
          }
          field += text[i];
          i++;
        }
        while (i < n && (text[i] === " " || text[i] === "\t")) i++;
        if (i < n && text[i] !== "," && text[i] !== "\r" && text[i] !== "\n") {
          throw fileError("text after a closing quote (write a quote inside a quoted field as \"\")", line, "row");
        }
        fields.push(field);
        field = "";
        if (text[i] === ",") {
          i++;
          continue;
        }
        break;
      }
      if (i >= n || ch === "\r" || ch === "\n") {
        fields.push(field.trim());
        break;
      }
      if (ch === ",") {
        fields.push(field.trim());
        field = "";
      } else {
        field += ch;
      }
      i++;
    }
    records.push({ line: start, fields });
    i = skipNewline(text, i);
    line++;
  }
  return records;
}

function skipNewline(text: string, i: number): number {
  if (text[i] === "\r" && text[i + 1] === "\n") return i + 2;
  return i < text.length ? i + 1 : i;
}

function quote(cell: string): string {
  if (/[",\r\n]/.test(cell) || cell !== cell.trim() || cell.startsWith("#")) return `"${cell.replace(/"/g, '""')}"`;
  return cell;
}

/** Shortest exact decimal of a plain number. */
function plain(x: number, k: number, field: string): string {
  if (!Number.isFinite(x)) throw new FormatError("INVALID_INPUT", `parts[${k}].${field} is not a finite number`, { field });
  return String(x);
}

/** SI-prefixed form when it reads back exactly ("4.7n"), else the shortest exact decimal. */
function si(x: number, k: number, field: string): string {
  const exact = plain(x, k, field);
  const pretty = formatSi(x, "", 15).replace("µ", "u");
  try {
    return parseSi(pretty) === x ? pretty : exact;
  } catch {
    return exact;
  }
}
