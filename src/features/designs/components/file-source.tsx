import { useState } from "react";
import type { Netlist } from "@shared/engine/netlist";
import { Alert } from "@/components/ui/alert";
import { TextField } from "@/components/ui/text-field";
import { readNetlistFile } from "@/features/designs/lib/read-netlist-file";

/** Start from a file: a netlist JSON, or a parts CSV with the two port nodes given here. */
export function FileSource({ onNetlist }: { onNetlist: (netlist: Netlist | null) => void }) {
  const [text, setText] = useState<string | null>(null);
  const [nodes, setNodes] = useState<[string, string]>(["n1", "n2"]);
  const [error, setError] = useState<string | null>(null);

  function load(content: string | null, portNodes: [string, string]) {
    setText(content);
    if (content === null) return onNetlist(null);
    try {
      onNetlist(readNetlistFile(content, portNodes));
      setError(null);
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
      onNetlist(null);
    }
  }

  return (
    <div className="flex flex-col gap-3">
      <label className="flex flex-col gap-1.5 text-sm font-semibold text-paper-200">
        Netlist (.json) or parts table (.csv)
        <input
          type="file"
          accept=".json,.csv,application/json,text/csv"
          className="text-xs font-normal text-paper-200"
          onChange={async (e) => {
            const file = e.target.files?.[0];
            if (file && file.size > 1024 * 1024) return setError("The file is larger than 1 MiB.");
            load(file ? await file.text() : null, nodes);
          }}
        />
      </label>
      <div className="grid gap-3 sm:grid-cols-2">
        {(["Port 1 node (CSV only)", "Port 2 node (CSV only)"] as const).map((label, k) => (
          <TextField
            key={label}
            label={label}
            value={nodes[k]}
            onChange={(e) => {
              const next: [string, string] = k === 0 ? [e.target.value, nodes[1]] : [nodes[0], e.target.value];
              setNodes(next);
              load(text, next);
            }}
          />
        ))}
      </div>
      {error && <Alert tone="error">{error}</Alert>}
    </div>
  );
}
