import type { KeyboardEvent } from "react";
import { cn } from "@/utils/cn";

export type CellInputProps = {
  row: number;
  col: number;
  label: string;
  value: string;
  error?: string;
  onChange: (text: string) => void;
  /** A select with these options (value, text); a text input when absent. */
  options?: ReadonlyArray<readonly [string, string]>;
  list?: string;
  className?: string;
  readOnly?: boolean;
};

const base = "h-8 w-full rounded border bg-ink-950 px-2 font-mono text-xs text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400";

/** One parts-table cell: labelled for assistive technology, red with its message when invalid. */
export function CellInput({ row, col, label, value, error, onChange, options, list, className, readOnly }: CellInputProps) {
  const errorId = `cell-${row}-${col}-error`;
  const common = {
    "aria-label": label,
    "aria-invalid": error ? true : undefined,
    "aria-describedby": error ? errorId : undefined,
    "data-cell": `${row}:${col}`,
    className: cn(base, error ? "border-fault-400" : "border-ink-600 hover:border-ink-500"),
  } as const;
  return (
    <div className={cn("flex flex-col gap-0.5", className)}>
      {options ? (
        <select {...common} value={value} disabled={readOnly} onChange={(e) => onChange(e.target.value)}>
          {options.map(([v, text]) => (
            <option key={v} value={v}>
              {text}
            </option>
          ))}
        </select>
      ) : (
        <input {...common} value={value} list={list} readOnly={readOnly} spellCheck={false} autoComplete="off" onChange={(e) => onChange(e.target.value)} />
      )}
      {error && (
        <p id={errorId} className="max-w-48 text-[11px] leading-tight font-semibold text-fault-300">
          {error}
        </p>
      )}
    </div>
  );
}

/**
 * Enter moves to the same column one row down (Shift+Enter: up); Tab keeps the browser's order,
 * which runs along the row. Attach to the table's container.
 */
export function handleGridKeys(event: KeyboardEvent<HTMLElement>) {
  if (event.key !== "Enter") return;
  const target = event.target as HTMLElement;
  const cell = target.dataset.cell;
  if (!cell) return;
  const [row, col] = cell.split(":").map(Number);
  const next = event.currentTarget.querySelector<HTMLElement>(`[data-cell="${row + (event.shiftKey ? -1 : 1)}:${col}"]`);
  event.preventDefault();
  next?.focus();
  if (next instanceof HTMLInputElement) next.select();
}
