import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Invitation } from "@/features/team/api/types";

export async function getInvitations(): Promise<Invitation[]> {
  const { invitations } = await api.get<{ invitations: Invitation[] }>("/team/invitations");
  return invitations;
}

export function getInvitationsQueryOptions() {
  return queryOptions({ queryKey: ["team", "invitations"] as const, queryFn: getInvitations });
}

export function useInvitations() {
  return useSuspenseQuery(getInvitationsQueryOptions());
}
