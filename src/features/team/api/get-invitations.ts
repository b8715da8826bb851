import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { teamKeys } from "@/features/team/api/keys";
import type { Invitation } from "@shared/contracts";

export async function getInvitations(): Promise<Invitation[]> {
  const { invitations } = await api.get<{ invitations: Invitation[] }>("/team/invitations");
  return invitations;
}

export function getInvitationsQueryOptions() {
  return queryOptions({ queryKey: teamKeys.invitations(), queryFn: getInvitations });
}

export function useInvitations() {
  return useSuspenseQuery(getInvitationsQueryOptions());
}
