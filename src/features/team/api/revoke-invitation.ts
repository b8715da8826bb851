import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { getInvitationsQueryOptions } from "@/features/team/api/get-invitations";

export async function revokeInvitation(id: string): Promise<void> {
  await api.delete(`/team/invitations/${encodeURIComponent(id)}`);
}

/** Revokes a pending invitation, so its link stops working. */
export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions().queryKey }),
  });
}
