import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { CreateInvitationInput } from "@shared/schemas/team";
import { createInvitationSchema } from "@shared/schemas/team";
import { api, checkBody } from "@/lib/api-client";
import { teamKeys } from "@/features/team/api/keys";
import type { Invitation } from "@shared/contracts";

export { createInvitationSchema } from "@shared/schemas/team";

export async function createInvitation(input: CreateInvitationInput): Promise<Invitation> {
  const { invitation } = await api.post<{ invitation: Invitation }>("/team/invitations", checkBody(createInvitationSchema, input));
  return invitation;
}

/** Invites an e-mail address with roles; the server mails the link. 409 ALREADY_MEMBER. */
export function useCreateInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvitation,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: teamKeys.invitations() }),
  });
}
