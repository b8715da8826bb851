import { useMemo, useReducer } from "react";
import type { ESeriesName, Netlist, PartKind, Port } from "@shared/engine/netlist";
import { checkTable, type TableCheck } from "@/features/designs/lib/check-rows";
import { blankRow, rowFromPart, type PartField, type PartRow } from "@/features/designs/lib/part-rows";

type State = { rows: PartRow[]; ports: Port[]; dirty: boolean };
type Action =
  | { type: "reset"; netlist: Netlist }
  | { type: "saved" }
  | { type: "set"; index: number; field: PartField; text: string }
  | { type: "add"; kind: PartKind }
  | { type: "remove"; index: number }
  | { type: "move"; index: number; by: -1 | 1 }
  | { type: "snap-all"; series: ESeriesName | "" }
  | { type: "port"; index: number; field: "name" | "node" | "z0"; text: string };

function fromNetlist(netlist: Netlist): State {
  return { rows: netlist.parts.map(rowFromPart), ports: netlist.ports.map((p) => ({ ...p })), dirty: false };
}

/**
 * "Snap all": every row gets the series; its value cell keeps the ideal value so the snapped value
 * and its error stay visible beside it. Clearing the series ("") leaves values as typed.
 */
function snapAll(rows: PartRow[], series: ESeriesName | ""): PartRow[] {
  return rows.map((row) => ({ ...row, series }));
}


function reducer(state: State, action: Action): State {
  const rows = [...state.rows];
  switch (action.type) {
    case "reset":
      return fromNetlist(action.netlist);
    case "saved":
      return { ...state, dirty: false };
    case "set":
      rows[action.index] = { ...rows[action.index], [action.field]: action.text };
      return { ...state, rows, dirty: true };
    case "add":
      return { ...state, rows: [...rows, blankRow(action.kind, rows)], dirty: true };
    case "remove":
      rows.splice(action.index, 1);
      return { ...state, rows, dirty: true };
    case "move": {
      const to = action.index + action.by;
      if (to < 0 || to >= rows.length) return state;
      [rows[action.index], rows[to]] = [rows[to], rows[action.index]];
      return { ...state, rows, dirty: true };
    }
    case "snap-all":
      return { ...state, rows: snapAll(rows, action.series), dirty: true };
    case "port": {
      const ports = state.ports.map((p, k) =>
        k !== action.index ? p : { ...p, [action.field]: action.field === "z0" ? Number(action.text) : action.text },
      );
      return { ...state, ports, dirty: true };
    }
  }
}

/** State of the parts table editor, with every cell checked on each change. */
export function usePartsEditor(initial: Netlist) {
  const [state, dispatch] = useReducer(reducer, initial, fromNetlist);
  const check: TableCheck = useMemo(() => checkTable(state.rows, state.ports), [state.rows, state.ports]);
  return { ...state, check, dispatch };
}

export type PartsEditor = ReturnType<typeof usePartsEditor>;
