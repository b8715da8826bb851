import { useId, type ComponentProps, type ReactNode } from "react";
import { cn } from "@/utils/cn";

export type CheckboxProps = Omit<ComponentProps<"input">, "id" | "type"> & {
  /** The accessible name; keep it short (tests find the box by it). */
  label: string;
  /** Extra text under the label, tied to the box with aria-describedby. */
  description?: ReactNode;
};

export function Checkbox({ label, description, className, ...props }: CheckboxProps) {
  const id = useId();
  const descriptionId = `${id}-description`;
  return (
    <div className={cn("flex items-start gap-2.5", className)}>
      <input
        id={id}
        type="checkbox"
        aria-describedby={description ? descriptionId : undefined}
        className="mt-0.5 size-4 shrink-0 cursor-pointer accent-signal-500 focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal-300"
        {...props}
      />
      <div className="flex flex-col">
        <label htmlFor={id} className="cursor-pointer font-mono text-sm text-paper-100">
          {label}
        </label>
        {description && (
          <span id={descriptionId} className="text-xs text-ink-300">
            {description}
          </span>
        )}
      </div>
    </div>
  );
}
