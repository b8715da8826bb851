import type { ReactNode } from "react";
import { QueryClientProvider, type QueryClient } from "@tanstack/react-query";
import { ErrorBoundary } from "@/components/errors/error-boundary";

function AppCrash({ error }: { error: Error }) {
  return (
    <main role="alert" className="mx-auto max-w-lg p-10">
      <h1 className="text-lg font-semibold text-paper-50">Lotwise stopped working</h1>
      <p className="mt-2 text-sm text-paper-200">{error.message}</p>
      <p className="mt-4 text-sm text-ink-300">Reload the page to start again.</p>
    </main>
  );
}

export function AppProvider({ queryClient, children }: { queryClient: QueryClient; children: ReactNode }) {
  return (
    <ErrorBoundary fallback={({ error }) => <AppCrash error={error} />}>
      <QueryClientProvider client={queryClient}>{children}</QueryClientProvider>
    </ErrorBoundary>
  );
}
