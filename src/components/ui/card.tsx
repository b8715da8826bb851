import type { ComponentProps, ReactNode } from "react";
import { cn } from "@/utils/cn";

export type CardProps = Omit<ComponentProps<"section">, "title"> & {
  title?: ReactNode;
  /** Controls shown at the right of the title row. */
  actions?: ReactNode;
  description?: ReactNode;
};

/** A bench panel: a titled surface that groups one job on a page. */
export function Card({ title, actions, description, className, children, ...props }: CardProps) {
  return (
    <section
      className={cn("rounded-lg border border-ink-700 bg-ink-900 shadow-bench", className)}
      {...props}
    >
      {(title || actions) && (
        <header className="flex flex-wrap items-start justify-between gap-3 border-b border-ink-700 px-5 py-3.5">
          <div>
            {title && <h2 className="text-base font-semibold text-paper-50">{title}</h2>}
            {description && <p className="mt-0.5 text-sm text-ink-300">{description}</p>}
          </div>
          {actions && <div className="flex items-center gap-2">{actions}</div>}
        </header>
      )}
      <div className="px-5 py-4">{children}</div>
    </section>
  );
}
