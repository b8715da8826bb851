import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { resetSessionCache } from "@/features/auth/api/session-cache";

export async function signOut(): Promise<void> {
  await api.post<void>("/auth/sign-out");
}

/** Ends the session; the cache is emptied even if the server could not be reached. */
export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => resetSessionCache(queryClient, null),
  });
}
