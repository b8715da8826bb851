import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
// TODO(lead): use api.put once src/lib/api-client.ts has it.
import { getGradesQueryOptions } from "@/features/grades/api/get-grades";
import type { Grade, GradeInput } from "@/features/grades/api/types";

export async function saveGrade({ id, data }: { id: string | null; data: GradeInput }): Promise<Grade> {
  const { grade } = id
    ? await api.put<{ grade: Grade }>(`/grades/${encodeURIComponent(id)}`, data)
    : await api.post<{ grade: Grade }>("/grades", data);
  return grade;
}

/** Adds (id null) or changes a grade (planner); 409 when the kind already has that code. */
export function useSaveGrade() {
  const queryClient = useQueryClient();
  return useMutation({ mutationFn: saveGrade, onSuccess: () => queryClient.invalidateQueries({ queryKey: getGradesQueryOptions().queryKey }) });
}

/** Removes a grade (planner). */
export function useDeleteGrade() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: string) => api.delete(`/grades/${encodeURIComponent(id)}`),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getGradesQueryOptions().queryKey }),
  });
}
