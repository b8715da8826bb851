import { Link } from "react-router-dom";
import { paths } from "@/config/paths";

const linkClass =
  "inline-flex h-8 items-center rounded-md border border-ink-600 bg-ink-800 px-3 text-xs font-semibold text-paper-100 hover:border-ink-500 hover:bg-ink-700 focus-visible:outline-2 focus-visible:outline-signal-300";

/** Downloads of a finished run: trials CSV (≤ 100,000 trials), nominal Touchstone, the printable report. */
export function ExportLinks({ runId, trials }: { runId: string; trials: number }) {
  const id = encodeURIComponent(runId);
  return (
    <nav aria-label="Exports" className="flex flex-wrap gap-2">
      {trials <= 100_000 && (
        <a className={linkClass} href={`/api/runs/${id}/trials.csv`} download>
          Trials CSV
        </a>
      )}
      <a className={linkClass} href={`/api/runs/${id}/nominal.s2p`} download>
        Nominal .s2p
      </a>
      <Link className={linkClass} to={paths.app.runReport.getHref(runId)}>
        Report
      </Link>
    </nav>
  );
}
