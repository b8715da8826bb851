import { cn } from "@/utils/cn";

/** A small turning ring; decorative, so hidden from assistive technology. */
export function Spinner({ className }: { className?: string }) {
  return (
    <span
      aria-hidden="true"
      className={cn(
        "inline-block size-4 animate-spin rounded-full border-2 border-current border-r-transparent",
        className,
      )}
    />
  );
}

/** A centred "loading" line for page regions waiting on data. */
export function LoadingRegion({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" className="flex items-center gap-3 px-1 py-6 text-sm text-ink-300">
      <Spinner className="text-signal-400" />
      <span>{label}</span>
    </div>
  );
}
