import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { SignInInput } from "@shared/schemas/auth";
import { api } from "@/lib/api-client";
import { resetSessionCache } from "@/features/auth/api/session-cache";
import type { AuthUserView as User } from "@shared/contracts";

export { signInSchema } from "@shared/schemas/auth";

export async function signIn(input: SignInInput): Promise<User> {
  const { user } = await api.post<{ user: User }>("/auth/sign-in", input);
  return user;
}

/** Signs in; on success the cache holds the new person and nothing from before. */
export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (user) => resetSessionCache(queryClient, user),
  });
}
