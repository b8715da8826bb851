import { Button } from "@/components/ui/button";
import { TableCell, TableRow } from "@/components/ui/table";
import { METRICS, RULE_FIELDS, RULE_LABELS, type RuleField, type RuleRow } from "@/features/limits/lib/rule-rows";
import { cn } from "@/utils/cn";

const cell = "h-8 w-full rounded border bg-ink-950 px-2 font-mono text-xs text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400";
const WIDTH: Record<RuleField, string> = { metric: "w-44", from: "w-24", to: "w-24", min: "w-20", max: "w-20", label: "w-40" };

export type RuleRowProps = {
  index: number;
  row: RuleRow;
  errors: Partial<Record<RuleField, string>>;
  readOnly: boolean;
  onChange: (field: RuleField, text: string) => void;
  onRemove: () => void;
};

/** One acceptance rule: metric, band [from, to] in Hz, min and/or max, label. */
export function RuleRowView({ index, row, errors, readOnly, onChange, onRemove }: RuleRowProps) {
  const n = index + 1;
  return (
    <TableRow>
      <TableCell className="pt-3 font-mono text-xs text-ink-400">{n}</TableCell>
      {RULE_FIELDS.map((field, col) => {
        const error = errors[field];
        const errorId = `rule-${index}-${field}-error`;
        const common = {
          "aria-label": `${RULE_LABELS[field]}, rule ${n}`,
          "aria-invalid": error ? true : undefined,
          "aria-describedby": error ? errorId : undefined,
          "data-cell": `${index}:${col}`,
          disabled: readOnly,
          className: cn(cell, error ? "border-fault-400" : "border-ink-600"),
        } as const;
        return (
          <TableCell key={field} className={cn("px-1.5 py-1.5", WIDTH[field])}>
            {field === "metric" ? (
              <select {...common} value={row.metric} onChange={(e) => onChange("metric", e.target.value)}>
                {METRICS.map(([v, text]) => (
                  <option key={v} value={v}>
                    {text}
                  </option>
                ))}
              </select>
            ) : (
              <input {...common} value={row[field]} spellCheck={false} autoComplete="off" onChange={(e) => onChange(field, e.target.value)} />
            )}
            {error && (
              <p id={errorId} className="mt-0.5 text-[11px] leading-tight font-semibold text-fault-300">
                {error}
              </p>
            )}
          </TableCell>
        );
      })}
      {!readOnly && (
        <TableCell className="px-1.5 py-1.5">
          <Button size="sm" variant="ghost" aria-label={`Remove rule ${n}`} onClick={onRemove}>
            ✕
          </Button>
        </TableCell>
      )}
    </TableRow>
  );
}
