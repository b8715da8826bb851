import type { QueryClient } from "@tanstack/react-query";
import { Link } from "react-router-dom";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { paths } from "@/config/paths";
import { RunHistory } from "@/features/history/components/run-history";
import { getDesignsQueryOptions } from "@/features/designs";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  void queryClient.prefetchQuery(getDesignsQueryOptions());
  return null;
};

const action =
  "inline-flex h-10 items-center rounded-md px-4 text-sm font-semibold focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal-300";

export default function HistoryRoute() {
  const user = useAppUser();
  return (
    <>
      <title>Runs · Lotwise</title>
      <PageHeader
        title="Runs"
        lead="Every stored run of every design: filter, sort, open one, or tick a few to compare them."
        actions={
          <div className="flex gap-2">
            {hasAnyRole(user.roles, ACCESS.launchSweeps) && (
              <Link className={`${action} border border-ink-600 bg-ink-800 text-paper-100 hover:bg-ink-700`} to={paths.app.newSweep.getHref()}>
                New grade sweep
              </Link>
            )}
            {hasAnyRole(user.roles, ACCESS.launchRuns) && (
              <Link className={`${action} bg-signal-500 text-ink-950 hover:bg-signal-400`} to={paths.app.newRun.getHref()}>
                New run
              </Link>
            )}
          </div>
        }
      />
      <Card>
        <RegionBoundary region="Run history">
          <RunHistory userId={user.id} />
        </RegionBoundary>
      </Card>
    </>
  );
}
