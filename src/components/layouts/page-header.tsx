import type { ReactNode } from "react";

/** The heading strip of a signed-in page. */
export function PageHeader({ title, lead, actions }: { title: string; lead?: ReactNode; actions?: ReactNode }) {
  return (
    <header className="mb-6 flex flex-wrap items-end justify-between gap-4">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight text-paper-50">{title}</h1>
        {lead && <p className="mt-1 max-w-3xl text-sm text-ink-300">{lead}</p>}
      </div>
      {actions}
    </header>
  );
}
