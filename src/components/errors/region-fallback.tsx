import { Button } from "@/components/ui/button";
import { ApiError } from "@/lib/api-client";
import type { ErrorFallbackProps } from "@/components/errors/error-boundary";

/** What a failed page region shows: what could not load, why, and a way to try again. */
export function RegionFallback({ error, reset, region }: ErrorFallbackProps & { region: string }) {
  const forbidden = error instanceof ApiError && error.status === 403;
  return (
    <div role="alert" className="rounded-lg border border-fault-500/50 bg-fault-900/40 px-5 py-4 text-sm">
      <p className="font-semibold text-fault-300">{region} could not be shown.</p>
      <p className="mt-1 text-paper-200">
        {forbidden ? "Your roles do not give access to this." : error.message || "An unexpected error occurred."}
      </p>
      {!forbidden && (
        <Button variant="secondary" size="sm" className="mt-3" onClick={reset}>
          Try again
        </Button>
      )}
    </div>
  );
}
