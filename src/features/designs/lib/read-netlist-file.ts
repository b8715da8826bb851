import type { Netlist } from "@shared/engine/netlist";
import { parsePartsCsv } from "@shared/formats/parts-csv";
import { netlistSchema } from "@shared/schemas/netlist";

/**
 * A new design's netlist from a file read in the browser: JSON (a whole netlist) or a parts CSV
 * (Lotwise columns), which has no ports, so two 50 Ω ports are placed on the given nodes.
 * The content decides the type (a JSON object starts with "{"), not the file name.
 * @throws Error naming the line and field ("line 4: value: …") or the JSON path
 */
export function readNetlistFile(text: string, portNodes: [string, string], z0 = 50): Netlist {
  const trimmed = text.replace(/^\uFEFF/, "").trimStart();
  if (trimmed.startsWith("{")) {
    let json: unknown;
    try {
      json = JSON.parse(trimmed);
    } catch (error) {
      throw new Error(`Not valid JSON: ${error instanceof Error ? error.message : String(error)}`);
    }
    const parsed = netlistSchema.safeParse(json);
    if (!parsed.success) {
      const issue = parsed.error.issues[0];
      throw new Error(`${issue.path.join(".") || "netlist"}: ${issue.message}`);
    }
    return parsed.data as Netlist;
  }
  const { parts } = parsePartsCsv(trimmed);
  return {
    ports: [
      { name: "in", node: portNodes[0], z0 },
      { name: "out", node: portNodes[1], z0 },
    ],
    parts,
  };
}

/** A one-part starting netlist for "blank": a 100 nH series inductor between two 50 Ω ports. */
export function blankNetlist(): Netlist {
  return {
    ports: [
      { name: "in", node: "n1", z0: 50 },
      { name: "out", node: "n2", z0: 50 },
    ],
    parts: [{ ref: "L1", kind: "L", nodes: ["n1", "n2"], value: 100e-9 }],
  };
}
