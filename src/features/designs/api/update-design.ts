import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { DesignView } from "@shared/contracts";
import { updateDesignSchema, type UpdateDesignInput as UpdateDesignBody } from "@shared/schemas/design";
import { api, checkBody } from "@/lib/api-client";
import { designKeys } from "@/features/designs/api/keys";

export type UpdateDesignInput = { id: string; data: UpdateDesignBody };

export async function updateDesign({ id, data }: UpdateDesignInput): Promise<DesignView> {
  const { design } = await api.patch<{ design: DesignView }>(`/designs/${encodeURIComponent(id)}`, checkBody(updateDesignSchema, data));
  return design;
}

/** Renames, re-classifies or (un)archives a design (designer): its lists and its page change. */
export function useUpdateDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateDesign,
    onSuccess: (design) => {
      queryClient.setQueryData(designKeys.detail(design.id), (d: { design: DesignView } | undefined) => (d ? { ...d, design } : d));
      return queryClient.invalidateQueries({ queryKey: designKeys.all });
    },
  });
}
