import { useId, type ComponentProps } from "react";
import { cn } from "@/utils/cn";

export type TextFieldProps = Omit<ComponentProps<"input">, "id"> & {
  label: string;
  /** Shown beside the field and announced with it; also marks the field invalid. */
  error?: string;
  hint?: string;
};

/** A labelled text input; the label is the input's accessible name. */
export function TextField({ label, error, hint, className, type = "text", ...props }: TextFieldProps) {
  const id = useId();
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const describedBy = [hint && hintId, error && errorId].filter(Boolean).join(" ") || undefined;

  return (
    <div className={cn("flex flex-col gap-1.5", className)}>
      <label htmlFor={id} className="text-sm font-semibold text-paper-200">
        {label}
      </label>
      <input
        id={id}
        type={type}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={cn(
          "h-10 rounded-md border bg-ink-950 px-3 text-sm text-paper-50 placeholder:text-ink-500",
          "focus-visible:outline-2 focus-visible:outline-offset-1 focus-visible:outline-signal-400",
          error ? "border-fault-400" : "border-ink-600 hover:border-ink-500",
        )}
        {...props}
      />
      {hint && !error && (
        <p id={hintId} className="text-xs text-ink-300">
          {hint}
        </p>
      )}
      {error && (
        <p id={errorId} className="text-xs font-semibold text-fault-300">
          {error}
        </p>
      )}
    </div>
  );
}
