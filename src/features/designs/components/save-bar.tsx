import { useState } from "react";
import { useNavigate } from "react-router-dom";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { paths } from "@/config/paths";
import { ApiError } from "@/lib/api-client";
import { useSaveRevision } from "@/features/designs/api/save-revision";
import type { Revision } from "@shared/contracts";
import type { PartsEditor } from "@/features/designs/hooks/use-parts-editor";

/**
 * Save (PUT the open revision) or "Save as new revision" (POST with this one as parent). A revision
 * that a run references is locked: only the second is offered. Disabled while any cell has an error.
 */
export function SaveBar({ editor, revision, canEdit }: { editor: PartsEditor; revision: Revision; canEdit: boolean }) {
  const [note, setNote] = useState("");
  const [saved, setSaved] = useState<string | null>(null);
  const save = useSaveRevision();
  const navigate = useNavigate();
  const { netlist, errorCount } = editor.check;
  const blocked = !canEdit || !netlist || errorCount > 0;

  function submit(asNew: boolean) {
    if (!netlist) return;
    setSaved(null);
    save.mutate(
      { designId: revision.designId, revisionId: asNew ? null : revision.id, parentId: revision.id, netlist, sweep: revision.sweep, note: note || undefined },
      {
        onSuccess: (next) => {
          setSaved(`Saved as r${next.number}.`);
          editor.dispatch({ type: "saved" });
          if (next.id !== revision.id) navigate(paths.app.design.getHref(revision.designId, next.id));
        },
      },
    );
  }

  const err = save.error instanceof ApiError ? save.error : null;
  return (
    <div className="flex flex-col gap-2">
      <div className="flex flex-wrap items-end gap-2">
        <label className="flex min-w-64 flex-1 flex-col gap-1 text-xs font-semibold text-paper-200">
          Note for this revision
          <input
            className="h-9 rounded-md border border-ink-600 bg-ink-950 px-3 text-sm text-paper-50"
            value={note}
            maxLength={500}
            disabled={!canEdit}
            onChange={(e) => setNote(e.target.value)}
          />
        </label>
        {!revision.locked && (
          <Button disabled={blocked || !editor.dirty} pending={save.isPending && save.variables?.revisionId !== null} onClick={() => submit(false)}>
            Save r{revision.number}
          </Button>
        )}
        <Button variant={revision.locked ? "primary" : "secondary"} disabled={blocked} pending={save.isPending && save.variables?.revisionId === null} onClick={() => submit(true)}>
          Save as new revision
        </Button>
      </div>
      {!canEdit && <p className="text-xs text-ink-300">Only a designer can save parts.</p>}
      {revision.locked && (
        <p className="text-xs text-signal-300">
          {revision.reviewState === "draft" ? `A run uses r${revision.number}` : `r${revision.number} has been submitted for sign-off`}, so it is kept as it is; changes go into a new revision made from it.
        </p>
      )}
      {errorCount > 0 && <p className="text-xs text-fault-300">Fix the marked cells to save.</p>}
      {err && (
        <Alert tone="error" title={err.code === "REVISION_LOCKED" ? "This revision is locked" : "Not saved"}>
          {err.message}
          {err.fields && (
            <ul className="mt-1 font-mono text-xs">
              {Object.entries(err.fields).map(([k, v]) => (
                <li key={k}>
                  {k}: {v}
                </li>
              ))}
            </ul>
          )}
        </Alert>
      )}
      {saved && <Alert tone="success">{saved}</Alert>}
    </div>
  );
}
