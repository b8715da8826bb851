import type { ComponentProps } from "react";
import { cn } from "@/utils/cn";
import { Spinner } from "@/components/ui/spinner";

const variants = {
  primary:
    "bg-signal-500 text-ink-950 hover:bg-signal-400 active:bg-signal-600 disabled:bg-signal-700 disabled:text-ink-800",
  secondary:
    "border border-ink-600 bg-ink-800 text-paper-100 hover:border-ink-500 hover:bg-ink-700 disabled:text-ink-400",
  ghost: "text-paper-200 hover:bg-ink-800 hover:text-paper-50 disabled:text-ink-500",
  danger:
    "border border-fault-500/60 bg-transparent text-fault-300 hover:bg-fault-900 disabled:border-ink-600 disabled:text-ink-500",
} as const;

const sizes = {
  sm: "h-8 px-3 text-xs",
  md: "h-10 px-4 text-sm",
} as const;

export type ButtonProps = ComponentProps<"button"> & {
  variant?: keyof typeof variants;
  size?: keyof typeof sizes;
  /** Shows a spinner and disables the button; the label stays, so its accessible name is stable. */
  pending?: boolean;
};

export function Button({
  variant = "primary",
  size = "md",
  pending = false,
  disabled,
  className,
  children,
  type = "button",
  ...props
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || pending}
      aria-busy={pending || undefined}
      className={cn(
        "inline-flex items-center justify-center gap-2 rounded-md font-semibold transition-colors",
        "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal-300",
        "disabled:cursor-not-allowed",
        variants[variant],
        sizes[size],
        className,
      )}
      {...props}
    >
      {pending && <Spinner className="size-3.5" />}
      {children}
    </button>
  );
}
