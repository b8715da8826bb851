import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { getDesignQueryOptions } from "@/features/designs/api/get-design";
import type { MeasuredSummary, Revision } from "@/features/designs/api/types";

export type UploadInput = { designId: string; file: File; name?: string; note?: string };

/** A parts table (.csv) or netlist (.json) as a new revision; 400 INVALID_FILE "line N: field: reason". */
export function useUploadRevision() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async ({ designId, file, note }: UploadInput) => {
      const fields: Record<string, string> = note ? { note } : {};
      const { revision } = await api.upload<{ revision: Revision }>(`/designs/${encodeURIComponent(designId)}/revisions/upload`, file, fields);
      return revision;
    },
    onSuccess: (_r, input) => queryClient.invalidateQueries({ queryKey: getDesignQueryOptions(input.designId).queryKey }),
  });
}

/** A measured Touchstone response (.s2p/.s1p) stored with the design for the overlay. */
export function useUploadMeasured() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async ({ designId, file, name }: UploadInput) => {
      const { measured } = await api.upload<{ measured: MeasuredSummary }>(`/designs/${encodeURIComponent(designId)}/measured`, file, {
        name: name || file.name.replace(/\.[^.]+$/, ""),
      });
      return measured;
    },
    onSuccess: (_m, input) => queryClient.invalidateQueries({ queryKey: getDesignQueryOptions(input.designId).queryKey }),
  });
}

/** Removes a measured response (designer). */
export function useDeleteMeasured(designId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/measured/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getDesignQueryOptions(designId).queryKey }),
  });
}
