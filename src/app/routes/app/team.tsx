import type { QueryClient } from "@tanstack/react-query";
import { ACCESS, hasAnyRole } from "@shared/contracts";
import { ForbiddenNotice } from "@/components/errors/forbidden-notice";
import { RegionBoundary } from "@/components/errors/region-boundary";
import { PageHeader } from "@/components/layouts/page-header";
import { Card } from "@/components/ui/card";
import { getMeQueryOptions } from "@/features/auth/api/get-me";
import { getInvitationsQueryOptions } from "@/features/team/api/get-invitations";
import { getMembersQueryOptions } from "@/features/team/api/get-members";
import { InvitationsTable } from "@/features/team/components/invitations-table";
import { InviteForm } from "@/features/team/components/invite-form";
import { MembersTable } from "@/features/team/components/members-table";
import { getComputeLimitsQueryOptions } from "@/features/settings/api/compute-limits";
import { ComputeLimitsForm } from "@/features/settings/components/compute-limits-form";
import { useAppUser } from "@/app/routes/app/app-context";

/** Starts both team reads while the page module loads (admins only; others would get 403). */
export const clientLoader = (queryClient: QueryClient) => async () => {
  const me = await queryClient.ensureQueryData(getMeQueryOptions());
  if (me && hasAnyRole(me.roles, ACCESS.administer)) {
    void queryClient.prefetchQuery(getMembersQueryOptions());
    void queryClient.prefetchQuery(getInvitationsQueryOptions());
    void queryClient.prefetchQuery(getComputeLimitsQueryOptions());
  }
  return null;
};

export default function TeamRoute() {
  const user = useAppUser();
  if (!hasAnyRole(user.roles, ACCESS.administer)) {
    return <ForbiddenNotice screen="Team" role="admin" />;
  }

  return (
    <>
      <title>Team · Lotwise</title>
      <PageHeader title="Team" lead="People, their roles and their invitations. Changes apply at once." />
      <div className="flex flex-col gap-6">
        <Card title="Members" description="Press a role to give or take it. A deactivated member cannot sign in.">
          <RegionBoundary region="Members">
            <MembersTable currentUserId={user.id} />
          </RegionBoundary>
        </Card>
        <div className="grid gap-6 xl:grid-cols-[minmax(18rem,24rem)_1fr]">
          <Card title="Invite someone" description="The link in the mail works once and expires.">
            <RegionBoundary region="The invite form">
              <InviteForm />
            </RegionBoundary>
          </Card>
          <Card title="Invitations">
            <RegionBoundary region="Invitations">
              <InvitationsTable />
            </RegionBoundary>
          </Card>
        </div>
        <Card title="Compute limits" description="What one run or one export may cost, so no single request holds the team's queue.">
          <RegionBoundary region="Compute limits">
            <ComputeLimitsForm />
          </RegionBoundary>
        </Card>
      </div>
    </>
  );
}
