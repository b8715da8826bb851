import type { Grade } from "@shared/contracts";
import type { Part as NetlistPartJson } from "@shared/engine/netlist";
import type { Assignment } from "@/features/sweeps/api/sweeps";

/**
 * Starting assignments for a sweep: level k gives every part the k-th cheapest grade of its kind
 * (the last one when a kind has fewer grades), from the cheapest level to the tightest. At most 12.
 */
export function defaultAssignments(parts: NetlistPartJson[], grades: Grade[]): Assignment[] {
  const byKind = new Map<string, Grade[]>();
  for (const g of grades) byKind.set(g.kind, [...(byKind.get(g.kind) ?? []), g]);
  for (const list of byKind.values()) list.sort((a, b) => a.costEach - b.costEach);
  const kinds = [...new Set(parts.map((p) => p.kind))].filter((k) => byKind.has(k));
  const levels = Math.min(12, Math.max(0, ...kinds.map((k) => byKind.get(k)!.length)));
  const out: Assignment[] = [];
  for (let level = 0; level < levels; level++) {
    const gradeOverrides: Record<string, string> = {};
    for (const p of parts) {
      const list = byKind.get(p.kind);
      if (list) gradeOverrides[p.ref] = list[Math.min(level, list.length - 1)].code;
    }
    out.push({ label: [...new Set(Object.values(gradeOverrides))].join(" + "), gradeOverrides });
  }
  return out;
}
