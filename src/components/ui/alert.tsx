import type { ReactNode } from "react";
import { cn } from "@/utils/cn";

const tones = {
  error: "border-fault-500/60 bg-fault-900/60 text-fault-300",
  success: "border-pass-500/50 bg-pass-900/60 text-pass-300",
  info: "border-ink-600 bg-ink-800 text-paper-200",
  caution: "border-signal-600/70 bg-signal-700/15 text-signal-200",
} as const;

export type AlertProps = {
  tone?: keyof typeof tones;
  title?: ReactNode;
  children?: ReactNode;
  className?: string;
  /** Overrides the live-region role, e.g. "note" for standing text. */
  role?: string;
};

/** A boxed message. Errors are announced at once (role="alert"), the rest politely. */
export function Alert({ tone = "info", title, children, className, role }: AlertProps) {
  return (
    <div
      role={role ?? (tone === "error" ? "alert" : "status")}
      className={cn("rounded-md border px-4 py-3 text-sm", tones[tone], className)}
    >
      {title && <p className="font-semibold">{title}</p>}
      {children && <div className={cn(title ? "mt-1" : undefined, "leading-relaxed")}>{children}</div>}
    </div>
  );
}
