import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Design, StressClass } from "@/features/designs/api/types";

export type UpdateDesignInput = { id: string; data: { name?: string; description?: string; stress?: StressClass; archived?: boolean } };

export async function updateDesign({ id, data }: UpdateDesignInput): Promise<Design> {
  const { design } = await api.patch<{ design: Design }>(`/designs/${encodeURIComponent(id)}`, data);
  return design;
}

/** Renames, re-classifies or (un)archives a design (designer). */
export function useUpdateDesign() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateDesign,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["designs"] }),
  });
}
