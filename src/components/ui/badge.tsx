import type { ReactNode } from "react";
import { cn } from "@/utils/cn";

const tones = {
  neutral: "border-ink-600 text-paper-200",
  signal: "border-signal-600/70 text-signal-300",
  pass: "border-pass-500/50 text-pass-300",
  fault: "border-fault-500/60 text-fault-300",
  muted: "border-ink-700 text-ink-400",
} as const;

/** A short mono tag for a role or a state. */
export function Badge({
  tone = "neutral",
  children,
  className,
}: {
  tone?: keyof typeof tones;
  children: ReactNode;
  className?: string;
}) {
  return (
    <span
      className={cn(
        "inline-flex items-center rounded border px-1.5 py-0.5 font-mono text-[11px] leading-none",
        tones[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}
