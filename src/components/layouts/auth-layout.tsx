import type { ReactNode } from "react";
import { Wordmark } from "@/components/layouts/brand-mark";

/** The frame of the signed-out pages: one panel on the bench, nothing else to get lost in. */
export function AuthLayout({ title, lead, children }: { title: string; lead?: ReactNode; children: ReactNode }) {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center px-4 py-10">
      <div className="w-full max-w-md">
        <div className="mb-6 flex justify-center">
          <Wordmark />
        </div>
        <div className="rounded-lg border border-ink-700 bg-ink-900 p-6 shadow-bench sm:p-8">
          <h1 className="text-xl font-semibold text-paper-50">{title}</h1>
          {lead && <div className="mt-1.5 text-sm text-ink-300">{lead}</div>}
          <div className="mt-6">{children}</div>
        </div>
        <p className="mt-6 text-center text-xs text-ink-400">
          Yield estimates for LC filters, before the parts are ordered.
        </p>
      </div>
    </main>
  );
}
