import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { Grade } from "@shared/contracts";
import { gradeBodySchema, type GradeBodyInput as GradeInput } from "@shared/schemas/design";
import { api, checkBody } from "@/lib/api-client";
import { gradeKeys } from "@/features/grades/api/keys";

export async function saveGrade({ id, data }: { id: string | null; data: GradeInput }): Promise<Grade> {
  const { grade } = id
    ? await api.put<{ grade: Grade }>(`/grades/${encodeURIComponent(id)}`, checkBody(gradeBodySchema, data))
    : await api.post<{ grade: Grade }>("/grades", checkBody(gradeBodySchema, data));
  return grade;
}

/** Adds (id null) or changes a grade (planner); 409 when the kind already has that code. */
export function useSaveGrade() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: saveGrade, onSuccess: () => queryClient.invalidateQueries({ queryKey: gradeKeys.all }) });
}

/** Removes a grade (planner). */
export function useDeleteGrade() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/grades/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: gradeKeys.all }),
  });
}
