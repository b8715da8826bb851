import { useId } from "react";

/** A labelled select matching TextField's look. */
export function SelectField<V extends string>({ label, value, options, onChange }: { label: string; value: V; options: ReadonlyArray<readonly [V, string]>; onChange: (v: V) => void }) {
  const id = useId();
  return (
    <div className="flex flex-col gap-1.5">
      <label htmlFor={id} className="text-sm font-semibold text-paper-200">
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value as V)} className="h-10 rounded-md border border-ink-600 bg-ink-950 px-3 text-sm text-paper-50">
        {options.map(([v, text]) => (
          <option key={v} value={v}>
            {text}
          </option>
        ))}
      </select>
    </div>
  );
}
