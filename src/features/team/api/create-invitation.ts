import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { CreateInvitationInput } from "@shared/schemas/team";
import { api } from "@/lib/api-client";
import { getInvitationsQueryOptions } from "@/features/team/api/get-invitations";
import type { Invitation } from "@/features/team/api/types";

export { createInvitationSchema } from "@shared/schemas/team";

export async function createInvitation(input: CreateInvitationInput): Promise<Invitation> {
  const { invitation } = await api.post<{ invitation: Invitation }>("/team/invitations", input);
  return invitation;
}

/** Invites an e-mail address with roles; the server mails the link. 409 ALREADY_MEMBER. */
export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitationsQueryOptions().queryKey }),
  });
}
