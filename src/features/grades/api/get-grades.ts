import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import { gradeKeys } from "@/features/grades/api/keys";
import type { Grade } from "@shared/contracts";

export async function getGrades(): Promise<Grade[]> {
  const { grades } = await api.get<{ grades: Grade[] }>("/grades");
  return grades;
}

export function getGradesQueryOptions() {
  return queryOptions({ queryKey: gradeKeys.all, queryFn: getGrades });
}

/** The team's grade catalogue, sorted by kind then cost. */
export function useGrades() {
  return useSuspenseQuery(getGradesQueryOptions());
}
