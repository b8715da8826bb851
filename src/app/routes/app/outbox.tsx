import { useQueryClient, type QueryClient } from "@tanstack/react-query";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { getMeQueryOptions } from "@/features/auth/api/get-me";
import { getOutboxQueryOptions } from "@/features/outbox/api/get-outbox";
import { OutboxView } from "@/features/outbox/components/outbox-view";
import { useAppUser } from "@/app/routes/app/app-context";

export const clientLoader = (queryClient: QueryClient) => async () => {
  const me = await queryClient.ensureQueryData(getMeQueryOptions());
  if (me && hasAnyRole(me.roles, ACCESS.administer)) void queryClient.prefetchQuery(getOutboxQueryOptions());
  return null;
};

/** The local mail stand-in's stored mail (development and demo only). */
export default function OutboxRoute() {
  const user = useAppUser();
  const queryClient = useQueryClient();
  if (!hasAnyRole(user.roles, ACCESS.administer)) {
    return <ForbiddenNotice screen="Outbox" role="admin" />;
  }

  return (
    <>
      <title>Outbox · Lotwise</title>
      <PageHeader
        title="Outbox"
        lead="Every mail Lotwise sent through its local stand-in, newest first."
        actions={
          <Button
            variant="secondary"
            size="sm"
            onClick={() => queryClient.invalidateQueries({ queryKey: getOutboxQueryOptions().queryKey })}
          >
            Refresh
          </Button>
        }
      />
      <Alert tone="caution" role="note" className="mb-6" title="Development and demo only">
        This is the local mail stand-in: nothing here left the machine. With a real SMTP server
        configured, mail goes out to the recipients and this list stays empty.
      </Alert>
      <RegionBoundary region="The outbox">
        <OutboxView />
      </RegionBoundary>
    </>
  );
}
