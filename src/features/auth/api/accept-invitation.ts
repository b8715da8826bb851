import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { AcceptInvitationInput } from "@shared/schemas/auth";
import { api } from "@/lib/api-client";
import { resetSessionCache } from "@/features/auth/api/session-cache";
import type { AuthUserView as User } from "@shared/contracts";

export { acceptInvitationSchema } from "@shared/schemas/auth";

/** Creates the account; the server also signs the new person in (session cookie set). */
export async function acceptInvitation(input: AcceptInvitationInput): Promise<User> {
  const { user } = await api.post<{ user: User }>("/auth/accept-invitation", input);
  return user;
}

export function useAcceptInvitation() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvitation,
    onSuccess: (user) => resetSessionCache(queryClient, user),
  });
}
