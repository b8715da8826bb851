import type { ESeriesName, Part, PartKind } from "@shared/engine/netlist";
import { formatSi } from "@shared/units";
import { formatToleranceText } from "@/features/designs/lib/tolerance-text";

/** The editable cells of one parts-table row, in column (Tab) order. */
export const PART_FIELDS = [
  "ref", "kind", "node1", "node2", "value", "series", "tolerance", "distribution", "lot", "grade",
  "q", "srf", "esr", "esl", "tempco",
] as const;
export type PartField = (typeof PART_FIELDS)[number];

/** Loss and parasitic columns, shown on request. */
export const EXTRA_FIELDS: readonly PartField[] = ["q", "srf", "esr", "esl", "tempco"];

export const FIELD_LABELS: Record<PartField, string> = {
  ref: "Ref", kind: "Kind", node1: "Node 1", node2: "Node 2", value: "Value", series: "Series",
  tolerance: "Tolerance", distribution: "Distribution", lot: "Lot", grade: "Grade",
  q: "Q@f", srf: "SRF", esr: "ESR", esl: "ESL", tempco: "Tempco",
};

export const E_SERIES: readonly ESeriesName[] = ["E6", "E12", "E24", "E48", "E96", "E192"];
export const KIND_UNITS: Record<PartKind, string> = { R: "Ω", L: "H", C: "F" };

/** A row as typed: every cell is text, so a half-typed value stays in the cell with its error. */
export type PartRow = { key: string } & Record<PartField, string>;

let keySeq = 0;
/** A key unique within this page (React list key; not stored). */
export function nextRowKey(): string {
  keySeq += 1;
  return `row-${keySeq}`;
}

/** A new blank row: the next free ref of the kind, wired from the previous row's second node to ground. */
export function blankRow(kind: PartKind, rows: readonly PartRow[]): PartRow {
  const used = new Set(rows.map((r) => r.ref));
  let n = 1;
  while (used.has(`${kind}${n}`)) n += 1;
  const previous = rows[rows.length - 1];
  return {
    key: nextRowKey(), ref: `${kind}${n}`, kind, node1: previous?.node2 && previous.node2 !== "gnd" ? previous.node2 : "n1", node2: "gnd",
    value: "", series: "", tolerance: "", distribution: "", lot: "", grade: "", q: "", srf: "", esr: "", esl: "", tempco: "",
  };
}

/** A netlist part as table text (values with SI prefixes and units). */
export function rowFromPart(part: Part): PartRow {
  const unit = KIND_UNITS[part.kind];
  return {
    key: nextRowKey(),
    ref: part.ref,
    kind: part.kind,
    node1: part.nodes[0],
    node2: part.nodes[1],
    value: formatSi(part.value, unit),
    series: part.series ?? "",
    tolerance: formatToleranceText(part, unit),
    distribution: part.distribution ?? "",
    lot: part.lot ?? "",
    grade: part.grade ?? "",
    q: part.q ? `${part.q.value} @ ${formatSi(part.q.at, "Hz")}` : "",
    srf: part.srf !== undefined ? formatSi(part.srf, "Hz") : "",
    esr: part.esr !== undefined ? formatSi(part.esr, "Ω") : "",
    esl: part.esl !== undefined ? formatSi(part.esl, "H") : "",
    tempco: part.tempco !== undefined ? String(part.tempco) : "",
  };
}
