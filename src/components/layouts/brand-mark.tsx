import { cn } from "@/utils/cn";

/** Lotwise's mark: a spread curve above a short lot of parts. */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" fill="none" aria-hidden="true" className={cn("size-8", className)}>
      <rect width="32" height="32" rx="7" className="fill-ink-800" />
      <path
        d="M5 23 C 10 23, 11 9, 16 9 S 22 23, 27 23"
        className="stroke-signal-400"
        strokeWidth="2.4"
        strokeLinecap="round"
      />
      <path d="M5 26.5 H27 M11 26.5 V23.5 M16 26.5 V20.5 M21 26.5 V23.5" className="stroke-ink-300" strokeWidth="1.6" strokeLinecap="round" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="flex items-center gap-2.5">
      <BrandMark />
      <span className="text-lg font-semibold tracking-tight text-paper-50">Lotwise</span>
    </span>
  );
}
