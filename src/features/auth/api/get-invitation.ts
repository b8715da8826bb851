import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { authKeys } from "@/features/auth/api/keys";
import type { InvitationPreview } from "@shared/contracts";

export async function getInvitation(token: string): Promise<InvitationPreview> {
  const { invitation } = await api.get<{ invitation: InvitationPreview }>(
    `/auth/invitations/${encodeURIComponent(token)}`,
  );
  return invitation;
}

export function getInvitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: authKeys.invitation(token),
    queryFn: () => getInvitation(token),
    staleTime: 60_000,
  });
}

export function useInvitation(token: string) {
  return useQuery(getInvitationQueryOptions(token));
}
