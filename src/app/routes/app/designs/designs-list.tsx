import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { Checkbox } from "@/components/ui/checkbox";
import { paths } from "@/config/paths";
import { getDesignsQueryOptions } from "@/features/designs/api/get-designs";
import { DesignsTable } from "@/features/designs/components/designs-table";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getDesignsQueryOptions(false));
  return null;
};

export default function DesignsRoute() {
  const user = useAppUser();
  const [archived, setArchived] = useState(false);
  const isDesigner = hasAnyRole(user.roles, ACCESS.editDesigns);
  return (
    <>
      <title>Designs · Lotwise</title>
      <PageHeader
        title="Designs"
        lead="Every filter the team is developing, with its latest revision and the yield of its newest finished run."
        actions={
          isDesigner && (
            <Link to={paths.app.newDesign.getHref()} className="inline-flex h-10 items-center rounded-md bg-signal-500 px-4 text-sm font-semibold text-ink-950 hover:bg-signal-400">
              New design
            </Link>
          )
        }
      />
      <Card actions={<Checkbox label="Show archived" checked={archived} onChange={(e) => setArchived(e.target.checked)} />} title={archived ? "Archived designs" : "Active designs"}>
        <RegionBoundary region="Designs">
          <DesignsTable archived={archived} canArchive={isDesigner} />
        </RegionBoundary>
      </Card>
    </>
  );
}
