import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { getGradesQueryOptions } from "@/features/grades/api/get-grades";
import type { Grade } from "@shared/contracts";
import { GradeForm } from "@/features/grades/components/grade-form";
import { GradesTable } from "@/features/grades/components/grades-table";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getGradesQueryOptions());
  return null;
};

export default function GradesRoute() {
  const user = useAppUser();
  const canEdit = hasAnyRole(user.roles, ACCESS.editLimits);
  const [editing, setEditing] = useState<Grade | null>(null);
  const [formKey, setFormKey] = useState(0); // a new key empties the form after each save
  const done = () => {
    setEditing(null);
    setFormKey((k) => k + 1);
  };
  return (
    <>
      <title>Grades · Lotwise</title>
      <PageHeader title="Grades" lead="The tolerance grades the team buys, per part kind, with their cost each. Parts name a grade by its code; runs price the bill of materials from it." />
      <div className="grid gap-6 xl:grid-cols-[1fr_22rem]">
        <Card title="Catalogue">
          <RegionBoundary region="Grades">
            <GradesTable canEdit={canEdit} onEdit={setEditing} />
          </RegionBoundary>
        </Card>
        {canEdit && (
          <Card title={editing ? `Edit ${editing.kind} ${editing.code}` : "Add a grade"}>
            <GradeForm key={editing?.id ?? `new-${formKey}`} grade={editing} onDone={done} />
          </Card>
        )}
      </div>
    </>
  );
}
