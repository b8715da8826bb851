import { useId } from "react";
import { cn } from "@/utils/cn";

export type SelectProps = {
  label: string;
  value: string;
  onChange: (value: string) => void;
  options: { value: string; label: string }[];
  error?: string;
  className?: string;
  /** A first, empty choice with this text. */
  placeholder?: string;
};

/** A labelled native select in the bench style (the label is its accessible name). */
export function Select({ label, value, onChange, options, error, className, placeholder }: SelectProps) {
  const id = useId();
  return (
    <div className={cn("flex flex-col gap-1.5", className)}>
      <label htmlFor={id} className="text-sm font-semibold text-paper-200">
        {label}
      </label>
      <select
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        className={cn("h-10 rounded-md border bg-ink-950 px-2 text-sm text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400", error ? "border-fault-400" : "border-ink-600")}
      >
        {placeholder !== undefined && <option value="">{placeholder}</option>}
        {options.map((o) => (
          <option key={o.value} value={o.value}>{o.label}</option>
        ))}
      </select>
      {error && <p id={`${id}-error`} className="text-xs font-semibold text-fault-300">{error}</p>}
    </div>
  );
}
