import { queryOptions, useQuery } from "@tanstack/react-query";
import { api, ApiError } from "@/lib/api-client";
import type { AuthUserView as User } from "@shared/contracts";
import { authKeys } from "@/features/auth/api/keys";

/** The signed-in person, or null when nobody is signed in (401 is an answer here, not an error). */
export async function getMe(): Promise<User | null> {
  try {
    const { user } = await api.get<{ user: User }>("/auth/me");
    return user;
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) return null;
    throw error;
  }
}

export function getMeQueryOptions() {
  return queryOptions({
    queryKey: authKeys.me,
    queryFn: getMe,
    staleTime: 5 * 60_000,
  });
}

export function useMe() {
  return useQuery(getMeQueryOptions());
}
