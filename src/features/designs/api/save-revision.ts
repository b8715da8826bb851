import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Netlist } from "@shared/engine/netlist";
import { api } from "@/lib/api-client";
import { getDesignQueryOptions } from "@/features/designs/api/get-design";
import { getRevisionQueryOptions } from "@/features/designs/api/get-revision";
import type { Revision, SweepSetting } from "@/features/designs/api/types";

export type SaveRevisionInput = {
  designId: string;
  /** Set: overwrite this (unlocked) revision with PUT; null: POST a new revision. */
  revisionId: string | null;
  parentId?: string;
  netlist: Netlist;
  sweep?: SweepSetting;
  note?: string;
};

export async function saveRevision(input: SaveRevisionInput): Promise<Revision> {
  const body = { netlist: input.netlist, sweep: input.sweep, note: input.note };
  if (input.revisionId) {
    const { revision } = await api.put<{ revision: Revision }>(`/revisions/${encodeURIComponent(input.revisionId)}`, body);
    return revision;
  }
  const { revision } = await api.post<{ revision: Revision }>(`/designs/${encodeURIComponent(input.designId)}/revisions`, {
    ...body,
    parentId: input.parentId,
  });
  return revision;
}

/** Saves the parts table: PUT while the revision is unlocked, else a new revision from it. 409 REVISION_LOCKED. */
export function useSaveRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveRevision,
    onSuccess: (revision, input) => {
      queryClient.setQueryData(getRevisionQueryOptions(revision.id).queryKey, revision);
      void queryClient.invalidateQueries({ queryKey: getDesignQueryOptions(input.designId).queryKey });
      void queryClient.invalidateQueries({ queryKey: ["designs"], exact: false });
    },
  });
}
