import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { MeasuredSummary, Revision } from "@shared/contracts";
import { designKeys, measuredKeys, revisionKeys } from "@/features/designs/api/keys";

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
    onSuccess: (revision, input) => {
      queryClient.setQueryData(revisionKeys.detail(revision.id), revision);
      void queryClient.invalidateQueries({ queryKey: designKeys.lists() });
      return queryClient.invalidateQueries({ queryKey: designKeys.detail(input.designId) });
    },
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
    onSuccess: (_m, input) => queryClient.invalidateQueries({ queryKey: designKeys.detail(input.designId) }),
  });
}

/** Removes a measured response (designer). */
export function useDeleteMeasured(designId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/measured/${encodeURIComponent(id)}`),
    onSuccess: (_r, id) => {
      queryClient.removeQueries({ queryKey: measuredKeys.detail(id) });
      return queryClient.invalidateQueries({ queryKey: designKeys.detail(designId) });
    },
  });
}
