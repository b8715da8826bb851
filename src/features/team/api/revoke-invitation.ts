import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { teamKeys } from "@/features/team/api/keys";

export async function revokeInvitation(id: string): Promise<void> {
  await api.delete(`/team/invitations/${encodeURIComponent(id)}`);
}

/** Revokes a pending invitation, so its link stops working. */
export function useRevokeInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: teamKeys.invitations() }),
  });
}
