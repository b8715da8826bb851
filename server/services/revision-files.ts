/**
 * Uploaded files turned into what Lotwise stores: a parts table (CSV, ports from the design's newest revision) or a
 * netlist (JSON) into a revision's netlist, a Touchstone file into a measured response. Every problem is a
 * 400 INVALID_FILE naming the line and the field, raised before anything is written.
 */
import type { z } from "zod";
import type { DesignRevision } from "../entities";
import type { AppError } from "../errors";
import { isEngineError } from "../../shared/engine/errors";
import type { Netlist } from "../../shared/engine/netlist";
import { compileNetlist } from "../../shared/engine/solver";
import { parsePartsCsv } from "../../shared/formats/parts-csv";
import { parseTouchstone } from "../../shared/formats/touchstone";
import { netlistSchema } from "../../shared/schemas/netlist";
import { fromFormatError, invalidFile, KIND_NAME, lineOf, parseJsonWithLines, pathText, sniffKind, type UploadedText } from "./uploads";

/** Most frequencies of a measured response (a VNA sweep rarely has more; keeps the stored JSON small). */
export const MAX_MEASURED_POINTS = 20_001;

/** Engine/netlist field names as the CSV columns call them. */
const CSV_FIELD: Record<string, string> = { "nodes[0]": "node1", "nodes[1]": "node2", toleranceAbs: "tolerance_abs", "q.value": "q", "q.at": "q_at" };

/**
 * The netlist of an uploaded revision file (.csv parts table or .json netlist), checked like a typed one.
 * @throws AppError INVALID_FILE, e.g. "line 4: value: must be > 0" or "line 12: parts[2].nodes: …"
 */
export function netlistFromUpload(file: UploadedText, latest: DesignRevision): Netlist {
  if (file.extension !== "csv" && file.extension !== "json") {
    throw invalidFile(`"${file.fileName}" is neither a .csv parts table nor a .json netlist`, undefined, "file");
  }
  const kind = sniffKind(file.text);
  if (file.extension === "json" && kind !== "json") throw invalidFile(`the file is named .json but holds ${KIND_NAME[kind]}`, 1, "file");
  if (file.extension === "csv" && kind !== "csv") throw invalidFile(`the file is named .csv but holds ${KIND_NAME[kind]}`, 1, "file");
  return kind === "json" ? netlistFromJson(file.text) : netlistFromCsv(file.text, latest.netlist);
}

/**
 * A measured response from a .s1p/.s2p Touchstone file (v1.1 or v2.0, any option-line form), in the engine's
 * S layout. The content must look like Touchstone, whatever the name says.
 */
export function measuredFromUpload(file: UploadedText): { freqs: number[]; ports: number; z0: number[]; s: number[] } {
  if (file.extension !== "s1p" && file.extension !== "s2p") throw invalidFile(`"${file.fileName}" is not a .s1p or .s2p Touchstone file`, undefined, "file");
  const kind = sniffKind(file.text);
  const first = firstContentLine(file.text);
  if (kind === "json" || (kind === "csv" && first !== null && /[,;]/.test(first.text))) {
    throw invalidFile(`the file is named .${file.extension} but holds ${KIND_NAME[kind]}`, first?.line ?? 1, "file");
  }
  let data;
  try {
    data = parseTouchstone(file.text, { fileName: file.fileName });
  } catch (error) {
    throw fromFormatError(error);
  }
  if (data.freqs.length > MAX_MEASURED_POINTS) throw invalidFile(`${data.freqs.length} frequencies: at most ${MAX_MEASURED_POINTS} are kept per measured response`, undefined, "frequency");
  const nine = (x: number) => Number(x.toPrecision(9));
  return { freqs: Array.from(data.freqs), ports: data.ports, z0: data.z0, s: Array.from(data.s, nine) };
}

// HELPERS //

function netlistFromJson(text: string): Netlist {
  const { value, lines } = parseJsonWithLines(text);
  const parsed = netlistSchema.safeParse(value);
  if (!parsed.success) throw schemaError(parsed.error, (path) => ({ line: lineOf(lines, path), field: path || "netlist" }));
  const netlist = parsed.data as Netlist;
  compileOrFail(netlist, (path) => ({ line: lineOf(lines, path), field: path || "netlist" }));
  return netlist;
}

function netlistFromCsv(text: string, base: Netlist): Netlist {
  let parts;
  try {
    parts = parsePartsCsv(text).parts;
  } catch (error) {
    throw fromFormatError(error);
  }
  const rowLines = csvRowLines(text);
  const where = (path: string) => {
    const m = /^parts\[(\d+)\](?:\.(.+))?$/.exec(path);
    if (!m) return { line: undefined, field: path || "netlist" };
    const rest = m[2] ?? "ref";
    return { line: rowLines[Number(m[1])], field: CSV_FIELD[rest] ?? rest };
  };
  const netlist: Netlist = { ...(base.name !== undefined ? { name: base.name } : {}), ports: base.ports, parts };
  const parsed = netlistSchema.safeParse(netlist);
  if (!parsed.success) throw schemaError(parsed.error, where);
  compileOrFail(netlist, where);
  return netlist;
}

type Locate = (path: string) => { line: number | undefined; field: string };

function schemaError(error: z.ZodError, locate: Locate): AppError {
  const issue = error.issues[0];
  const { line, field } = locate(pathText(issue.path));
  return invalidFile(issue.message, line, field);
}

function compileOrFail(netlist: Netlist, locate: Locate): void {
  try {
    compileNetlist(netlist);
  } catch (error) {
    if (!isEngineError(error)) throw error;
    const { line, field } = locate(error.path ?? "");
    throw invalidFile(error.message, line, field);
  }
}

/**
 * 1-based line on which each data row of a parts table starts (header and blank/`#` lines skipped; a quoted cell
 * spanning lines keeps the row on its first line), matching parsePartsCsv's row order.
 */
function csvRowLines(text: string): number[] {
  const starts: number[] = [];
  let inQuote = false;
  let header = true;
  text.split(/\r\n|\n|\r/).forEach((raw, k) => {
    const quotes = (raw.match(/"/g) ?? []).length;
    if (!inQuote) {
      const t = raw.trim();
      if (t !== "" && !t.startsWith("#")) {
        if (header) header = false;
        else starts.push(k + 1);
      }
    }
    if (quotes % 2 === 1) inQuote = !inQuote;
  });
  return starts;
}

function firstContentLine(text: string): { line: number; text: string } | null {
  const lines = text.split(/\r\n|\n|\r/);
  for (let k = 0; k < lines.length; k++) {
    const t = lines[k].trim();
    if (t !== "" && !t.startsWith("!")) return { line: k + 1, text: t };
  }
  return null;
}
