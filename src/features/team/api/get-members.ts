import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { teamKeys } from "@/features/team/api/keys";
import type { Member } from "@shared/contracts";

export async function getMembers(): Promise<Member[]> {
  const { members } = await api.get<{ members: Member[] }>("/team/members");
  return members;
}

export function getMembersQueryOptions() {
  return queryOptions({ queryKey: teamKeys.members(), queryFn: getMembers });
}

export function useMembers() {
  return useSuspenseQuery(getMembersQueryOptions());
}
