import { useNavigate } from "react-router-dom";
import { Badge } from "@/components/ui/badge";
import { paths } from "@/config/paths";
import { REVIEW_STATE_TONE, type RevisionSummary } from "@shared/contracts";
import { formatDateTime } from "@/utils/format";


/** Which revision is open, its review state and whether a run or its review has locked it. */
export function RevisionBar({ designId, revisions, current }: { designId: string; revisions: RevisionSummary[]; current: RevisionSummary }) {
  const navigate = useNavigate();
  return (
    <div className="flex flex-wrap items-center gap-3">
      <label className="flex items-center gap-2 text-sm font-semibold text-paper-200">
        Revision
        <select
          className="h-9 rounded-md border border-ink-600 bg-ink-950 px-2 font-mono text-sm text-paper-50"
          value={current.id}
          onChange={(e) => navigate(paths.app.design.getHref(designId, e.target.value))}
        >
          {[...revisions].sort((a, b) => b.number - a.number).map((r) => (
            <option key={r.id} value={r.id}>
              r{r.number}
              {r.note ? ` — ${r.note.slice(0, 40)}` : ""}
            </option>
          ))}
        </select>
      </label>
      <Badge tone={REVIEW_STATE_TONE[current.reviewState]}>{current.reviewState}</Badge>
      {current.locked && <Badge tone="signal">{current.reviewState === "draft" ? "locked by a run" : "frozen for sign-off"}</Badge>}
      <span className="text-xs text-ink-300">
        by {current.createdBy.name}, {formatDateTime(current.createdAt)}
      </span>
    </div>
  );
}
