import { Suspense, type ReactNode } from "react";
import { QueryErrorResetBoundary } from "@tanstack/react-query";
import { useLocation } from "react-router-dom";
import { ErrorBoundary } from "@/components/errors/error-boundary";
import { RegionFallback } from "@/components/errors/region-fallback";
import { LoadingRegion } from "@/components/ui/spinner";

/**
 * One page region: waits for its suspense queries, and if it fails shows a readable fallback
 * in place while the rest of the page stays usable. "Try again" refetches the failed queries.
 */
export function RegionBoundary({ region, children }: { region: string; children: ReactNode }) {
  const location = useLocation();
  return (
    <QueryErrorResetBoundary>
      {({ reset }) => (
        <ErrorBoundary
          resetKey={location.key}
          onReset={reset}
          fallback={(props) => <RegionFallback {...props} region={region} />}
        >
          <Suspense fallback={<LoadingRegion label={`Loading ${region.toLowerCase()}…`} />}>{children}</Suspense>
        </ErrorBoundary>
      )}
    </QueryErrorResetBoundary>
  );
}
