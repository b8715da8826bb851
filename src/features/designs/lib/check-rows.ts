import { snapToSeries } from "@shared/engine/e-series";
import { isEngineError } from "@shared/engine/errors";
import type { ESeriesName, Netlist, Part, PartKind, Port } from "@shared/engine/netlist";
import { compileNetlist } from "@shared/engine/solver";
import { parseSi } from "@shared/units";
import type { PartField, PartRow } from "@/features/designs/lib/part-rows";
import { parseToleranceText } from "@/features/designs/lib/tolerance-text";

export type CellErrors = Partial<Record<PartField, string>>;

/** One row checked: the part it makes (null with errors), its ideal value and the snapped one. */
export type RowCheck = { part: Part | null; errors: CellErrors; ideal: number | null; snapped: { value: number; error: number } | null };

/** The whole table checked; `netlist` is set only when every cell is valid and the circuit compiles. */
export type TableCheck = { rows: RowCheck[]; netlist: Netlist | null; errorCount: number; tableError: string | null };

const REF = /^[A-Za-z0-9_.-]{1,32}$/;
const NODE = /^.{1,64}$/;

function positive(text: string, what: string, errors: CellErrors, field: PartField): number | undefined {
  if (text.trim() === "") return undefined;
  try {
    const v = parseSi(text);
    if (v > 0 && Number.isFinite(v)) return v;
    errors[field] = `${what} must be greater than 0.`;
  } catch {
    errors[field] = `Cannot read "${text}"; write e.g. 33p, 4.7 nH, 1.2k.`;
  }
  return undefined;
}

/** Validates one row's cells and builds its part. Value = the snapped value when a series is chosen. */
export function checkRow(row: PartRow): RowCheck {
  const errors: CellErrors = {};
  const kind = row.kind as PartKind;
  if (!REF.test(row.ref)) errors.ref = "Ref needs 1–32 letters, digits, _ . -";
  if (!["R", "L", "C"].includes(kind)) errors.kind = "Kind is R, L or C.";
  if (!NODE.test(row.node1.trim())) errors.node1 = "Node name is required.";
  if (!NODE.test(row.node2.trim())) errors.node2 = "Node name is required.";
  if (!errors.node2 && row.node1.trim() === row.node2.trim()) errors.node2 = "Both ends are on the same node.";
  const ideal = positive(row.value, "Value", errors, "value") ?? null;
  if (ideal === null && !errors.value) errors.value = "Value is required.";
  const snapped = ideal !== null && row.series ? snapToSeries(ideal, row.series as ESeriesName) : null;
  const tol = parseToleranceText(row.tolerance, kind);
  if (!tol.ok) errors.tolerance = tol.error;
  if (row.lot.length > 32) errors.lot = "Lot is at most 32 characters.";
  if (row.grade.length > 40) errors.grade = "Grade is at most 40 characters.";
  const q = parseQ(row.q, kind, errors);
  const srf = kind === "L" || !row.srf.trim() ? positive(row.srf, "SRF", errors, "srf") : void (errors.srf = "SRF applies to inductors.");
  const esr = kind === "C" || !row.esr.trim() ? positive(row.esr, "ESR", errors, "esr") : void (errors.esr = "ESR applies to capacitors.");
  const esl = kind === "C" || !row.esl.trim() ? positive(row.esl, "ESL", errors, "esl") : void (errors.esl = "ESL applies to capacitors.");
  const tempco = row.tempco.trim() === "" ? undefined : Number(row.tempco.replace(/\s*ppm.*$/i, ""));
  if (tempco !== undefined && !Number.isFinite(tempco)) errors.tempco = "Tempco is a number in ppm/°C.";
  if (Object.keys(errors).length > 0 || ideal === null || !tol.ok) return { part: null, errors, ideal, snapped };
  const part: Part = { ref: row.ref, kind, nodes: [row.node1.trim(), row.node2.trim()], value: snapped?.value ?? ideal, ...tol.value };
  if (row.series) part.series = row.series as ESeriesName;
  if (row.distribution === "normal" || row.distribution === "uniform") part.distribution = row.distribution;
  if (row.lot.trim()) part.lot = row.lot.trim();
  if (row.grade.trim()) part.grade = row.grade.trim();
  if (q) part.q = q;
  if (srf !== undefined) part.srf = srf;
  if (esr !== undefined) part.esr = esr;
  if (esl !== undefined) part.esl = esl;
  if (tempco !== undefined) part.tempco = tempco;
  return { part, errors, ideal, snapped };
}

/** "45 @ 250 MHz" → { value: 45, at: 2.5e8 }. */
function parseQ(text: string, kind: PartKind, errors: CellErrors): Part["q"] | undefined {
  if (text.trim() === "") return undefined;
  if (kind !== "L") return void (errors.q = "Q applies to inductors.");
  const [qText, atText] = text.split("@");
  const value = Number(qText.trim());
  if (!(value > 0) || atText === undefined) return void (errors.q = "Write Q at a frequency, e.g. 45 @ 250M.");
  const at = positive(atText, "Frequency", errors, "q");
  return at === undefined ? undefined : { value, at };
}

const PATH = /^parts\[(\d+)\]\.(\w+)/;

/** Checks every row, duplicate refs, then the circuit itself (compileNetlist), errors on the cell. */
export function checkTable(rows: readonly PartRow[], ports: Port[]): TableCheck {
  const checks = rows.map(checkRow);
  const seen = new Map<string, number>();
  rows.forEach((row, k) => {
    if (seen.has(row.ref) && !checks[k].errors.ref) checks[k] = { ...checks[k], part: null, errors: { ...checks[k].errors, ref: `Ref ${row.ref} is used twice.` } };
    seen.set(row.ref, k);
  });
  let errorCount = checks.reduce((n, c) => n + Object.keys(c.errors).length, 0);
  if (rows.length === 0) return { rows: checks, netlist: null, errorCount: 1, tableError: "Add at least one part." };
  if (errorCount > 0) return { rows: checks, netlist: null, errorCount, tableError: null };
  const netlist: Netlist = { ports, parts: checks.map((c) => c.part as Part) };
  try {
    compileNetlist(netlist);
    return { rows: checks, netlist, errorCount: 0, tableError: null };
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    const m = isEngineError(error) && error.path ? PATH.exec(error.path) : null;
    errorCount = 1;
    if (m && checks[Number(m[1])]) {
      const field: PartField = m[2] === "nodes" ? "node1" : m[2] === "value" ? "value" : m[2] === "ref" ? "ref" : "node1";
      checks[Number(m[1])] = { ...checks[Number(m[1])], errors: { [field]: message } };
      return { rows: checks, netlist: null, errorCount, tableError: null };
    }
    return { rows: checks, netlist: null, errorCount, tableError: message };
  }
}
