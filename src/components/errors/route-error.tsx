import { isRouteErrorResponse, useRouteError } from "react-router-dom";

/** Last line of defence for a whole route: a plain page with a way back. */
export function RouteError() {
  const error = useRouteError();
  const detail = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : "An unexpected error occurred.";

  return (
    <main className="flex min-h-screen items-center justify-center p-6">
      <div role="alert" className="max-w-md rounded-lg border border-fault-500/50 bg-ink-900 p-6 shadow-bench">
        <h1 className="text-lg font-semibold text-paper-50">This page could not be shown</h1>
        <p className="mt-2 text-sm text-paper-200">{detail}</p>
        <p className="mt-4 text-sm text-ink-300">
          Reload the page, or go back to the{" "}
          <a className="font-semibold text-signal-300 underline" href="/">
            start
          </a>
          .
        </p>
      </div>
    </main>
  );
}
