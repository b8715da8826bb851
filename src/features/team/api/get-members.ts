import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Member } from "@/features/team/api/types";

export async function getMembers(): Promise<Member[]> {
  const { members } = await api.get<{ members: Member[] }>("/team/members");
  return members;
}

export function getMembersQueryOptions() {
  return queryOptions({ queryKey: ["team", "members"] as const, queryFn: getMembers });
}

export function useMembers() {
  return useSuspenseQuery(getMembersQueryOptions());
}
