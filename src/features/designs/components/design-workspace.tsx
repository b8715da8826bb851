import { useState } from "react";
import { Card } from "@/components/ui/card";
import { useMeasured } from "@/features/designs/api/get-measured";
import type { DesignDetail, Revision } from "@shared/contracts";
import { usePartsEditor } from "@/features/designs/hooks/use-parts-editor";
import { NominalPlot, type MaskRule } from "@/features/designs/components/nominal-plot";
import { PartsTable, type GradeOption } from "@/features/designs/components/parts-table";
import { PortsEditor } from "@/features/designs/components/ports-editor";
import { RevisionBar } from "@/features/designs/components/revision-bar";
import { SaveBar } from "@/features/designs/components/save-bar";
import { StressCaution } from "@/features/designs/components/stress-caution";
import { UploadsPanel } from "@/features/designs/components/uploads-panel";

export type DesignWorkspaceProps = {
  detail: DesignDetail;
  revision: Revision;
  grades: GradeOption[];
  canEdit: boolean;
  canUploadMeasured: boolean;
  /** Limit rules to draw as a mask (from a chosen limit set), if any. */
  rules?: MaskRule[];
};

/** The design workspace: revision, ports, the parts table with saving, the nominal plot, uploads. */
export function DesignWorkspace({ detail, revision, grades, canEdit, canUploadMeasured, rules }: DesignWorkspaceProps) {
  const editor = usePartsEditor(revision.netlist);
  const [overlayId, setOverlayId] = useState<string | null>(null);
  const measured = useMeasured(overlayId);
  const summary = detail.revisions.find((r) => r.id === revision.id) ?? revision;

  return (
    <div className="flex flex-col gap-6">
      <StressCaution stress={detail.design.stress} />
      <Card title="Parts" actions={<RevisionBar designId={detail.design.id} revisions={detail.revisions} current={summary} />}>
        <div className="flex flex-col gap-4">
          <PortsEditor editor={editor} readOnly={!canEdit} />
          <PartsTable editor={editor} grades={grades} readOnly={!canEdit} />
          <SaveBar editor={editor} revision={revision} canEdit={canEdit} />
        </div>
      </Card>
      <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
        <Card title="Nominal response" description="Computed in your browser from the table above; it follows your edits.">
          <NominalPlot netlist={editor.check.netlist} sweep={revision.sweep} measured={measured.data ?? null} rules={rules} />
        </Card>
        <Card title="Files">
          <UploadsPanel
            designId={detail.design.id}
            measured={detail.measured}
            overlayId={overlayId}
            onOverlay={setOverlayId}
            canUploadParts={canEdit}
            canUploadMeasured={canUploadMeasured}
          />
        </Card>
      </div>
    </div>
  );
}
