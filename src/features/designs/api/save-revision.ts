import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Revision, SweepSetting } from "@shared/contracts";
import type { Netlist } from "@shared/engine/netlist";
import { replaceRevisionSchema, revisionBodySchema } from "@shared/schemas/design";
import { api, checkBody } from "@/lib/api-client";
import { designKeys, revisionKeys } from "@/features/designs/api/keys";

export type SaveRevisionInput = {
  designId: string;
  /** Set: overwrite this (unlocked) revision with PUT; null: POST a new revision. */
  revisionId: string | null;
  parentId?: string;
  netlist: Netlist;
  sweep?: SweepSetting;
  note?: string;
};

/** Checked with the server's own schemas before sending (a 400 then names the same fields). */
export async function saveRevision(input: SaveRevisionInput): Promise<Revision> {
  const body = { netlist: input.netlist, sweep: input.sweep, note: input.note };
  if (input.revisionId) {
    const { revision } = await api.put<{ revision: Revision }>(`/revisions/${encodeURIComponent(input.revisionId)}`, checkBody(replaceRevisionSchema, body));
    return revision;
  }
  const { revision } = await api.post<{ revision: Revision }>(
    `/designs/${encodeURIComponent(input.designId)}/revisions`,
    checkBody(revisionBodySchema, { ...body, parentId: input.parentId }),
  );
  return revision;
}

/** Saves the parts table: PUT while the revision is unlocked, else a new revision from it. 409 REVISION_LOCKED. */
export function useSaveRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveRevision,
    onSuccess: (revision, input) => {
      queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
      void queryClient.invalidateQueries({ queryKey: designKeys.detail(input.designId) });
      void queryClient.invalidateQueries({ queryKey: designKeys.lists() });
    },
  });
}
