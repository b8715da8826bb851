import type { Port } from "@shared/engine/netlist";
import type { PartsEditor } from "@/features/designs/hooks/use-parts-editor";

const input = "h-8 rounded border border-ink-600 bg-ink-950 px-2 font-mono text-xs text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400";

/** The ports: name, node and reference impedance z0 (Ω). Port order sets S-parameter indices. */
export function PortsEditor({ editor, readOnly }: { editor: PartsEditor; readOnly: boolean }) {
  return (
    <fieldset className="flex flex-wrap gap-4">
      <legend className="mb-2 text-xs font-semibold tracking-wide text-ink-300 uppercase">Ports</legend>
      {editor.ports.map((port: Port, index) => {
        const n = index + 1;
        const z0Bad = !(port.z0 > 0);
        return (
          <div key={index} className="flex items-center gap-2 rounded-md border border-ink-700 px-2 py-1.5">
            <span className="font-mono text-xs text-ink-400">P{n}</span>
            <input aria-label={`Port ${n} name`} className={`${input} w-16`} value={port.name} readOnly={readOnly} onChange={(e) => editor.dispatch({ type: "port", index, field: "name", text: e.target.value })} />
            <span className="text-xs text-ink-400">at</span>
            <input aria-label={`Port ${n} node`} className={`${input} w-16`} value={port.node} readOnly={readOnly} onChange={(e) => editor.dispatch({ type: "port", index, field: "node", text: e.target.value })} />
            <input
              aria-label={`Port ${n} z0 (ohm)`}
              aria-invalid={z0Bad || undefined}
              className={`${input} w-16 ${z0Bad ? "border-fault-400" : ""}`}
              inputMode="decimal"
              value={Number.isFinite(port.z0) ? String(port.z0) : ""}
              readOnly={readOnly}
              onChange={(e) => editor.dispatch({ type: "port", index, field: "z0", text: e.target.value })}
            />
            <span className="text-xs text-ink-400">Ω</span>
          </div>
        );
      })}
    </fieldset>
  );
}
