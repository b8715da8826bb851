import { useState } from "react";
import { useNavigate } from "react-router-dom";
import { Button } from "@/components/ui/button";
import { paths } from "@/config/paths";
import type { MeasuredSummary } from "@shared/contracts";
import { useDeleteMeasured, useUploadMeasured, useUploadRevision } from "@/features/designs/api/upload-files";
import { FileUpload } from "@/features/designs/components/file-upload";

export type UploadsPanelProps = {
  designId: string;
  measured: MeasuredSummary[];
  overlayId: string | null;
  onOverlay: (id: string | null) => void;
  canUploadParts: boolean;
  canUploadMeasured: boolean;
};

/** Parts table (CSV) or netlist (JSON) as a new revision; measured Touchstone responses for the overlay. */
export function UploadsPanel({ designId, measured, overlayId, onOverlay, canUploadParts, canUploadMeasured }: UploadsPanelProps) {
  const navigate = useNavigate();
  const parts = useUploadRevision();
  const touchstone = useUploadMeasured();
  const remove = useDeleteMeasured(designId);
  const [partsDone, setPartsDone] = useState<string | null>(null);
  const [measuredDone, setMeasuredDone] = useState<string | null>(null);

  return (
    <div className="flex flex-col gap-5">
      {canUploadParts && (
        <FileUpload
          label="Parts file (.csv or .json)"
          accept=".csv,.json,text/csv,application/json"
          hint="CSV columns: ref, kind, node1, node2, value, tolerance, distribution, tolerance_abs, series, lot, q, q_at, srf, esr, esl, tempco, grade. Ports come from the latest revision. Up to 1 MiB."
          pending={parts.isPending}
          error={parts.error}
          success={partsDone}
          onUpload={(file) =>
            parts.mutate({ designId, file }, {
              onSuccess: (revision) => {
                setPartsDone(`Stored as r${revision.number}.`);
                navigate(paths.app.design.getHref(designId, revision.id));
              },
            })
          }
        />
      )}
      {canUploadMeasured && (
        <FileUpload
          label="Measured response (.s2p or .s1p)"
          accept=".s2p,.s1p"
          hint="Touchstone 1.1 or 2.0, any option line; up to 5 MiB. Drawn over the nominal plot."
          pending={touchstone.isPending}
          error={touchstone.error}
          success={measuredDone}
          onUpload={(file) =>
            touchstone.mutate({ designId, file }, {
              onSuccess: (m) => {
                setMeasuredDone(`Stored ${m.name} (${m.points} points).`);
                onOverlay(m.id);
              },
            })
          }
        />
      )}
      {measured.length > 0 && (
        <ul aria-label="Measured responses" className="flex flex-col gap-1.5">
          {measured.map((m) => (
            <li key={m.id} className="flex items-center gap-2 text-sm">
              <label className="flex flex-1 items-center gap-2">
                <input type="radio" name="overlay" checked={overlayId === m.id} onChange={() => onOverlay(m.id)} className="accent-signal-500" />
                <span className="text-paper-100">{m.name}</span>
                <span className="font-mono text-xs text-ink-400">{m.points} pts</span>
              </label>
              {overlayId === m.id && (
                <Button size="sm" variant="ghost" onClick={() => onOverlay(null)}>
                  Hide
                </Button>
              )}
              {canUploadParts && (
                <Button size="sm" variant="ghost" aria-label={`Delete ${m.name}`} pending={remove.isPending && remove.variables === m.id} onClick={() => remove.mutate(m.id)}>
                  Delete
                </Button>
              )}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
