import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { UpdateMemberInput } from "@shared/schemas/team";
import { updateMemberSchema } from "@shared/schemas/team";
import { api, checkBody } from "@/lib/api-client";
import { teamKeys } from "@/features/team/api/keys";
import type { Member } from "@shared/contracts";

export { updateMemberSchema } from "@shared/schemas/team";

export async function updateMember({ id, data }: { id: string; data: UpdateMemberInput }): Promise<Member> {
  const { member } = await api.patch<{ member: Member }>(`/team/members/${encodeURIComponent(id)}`, checkBody(updateMemberSchema, data));
  return member;
}

/** Changes a member's name, roles or active state; 409 LAST_ADMIN keeps one active admin. */
export function useUpdateMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: teamKeys.members() }),
  });
}
