import type { QueryClient } from "@tanstack/react-query";
import { getMeQueryOptions } from "@/features/auth/api/get-me";
import type { AuthUserView as User } from "@shared/contracts";

/**
 * Starts the cache afresh for a new session (or none): drops everything read under the previous
 * one, so nobody sees another person's data, and records who is signed in now.
 */
export function resetSessionCache(queryClient: QueryClient, user: User | null): void {
  const meKey = getMeQueryOptions().queryKey;
  queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== meKey[0] });
  queryClient.setQueryData(meKey, user);
}
