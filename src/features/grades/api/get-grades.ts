import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { Grade } from "@/features/grades/api/types";

export async function getGrades(): Promise<Grade[]> {
  const { grades } = await api.get<{ grades: Grade[] }>("/grades");
  return grades;
}

export function getGradesQueryOptions() {
  return queryOptions({ queryKey: ["grades"] as const, queryFn: getGrades });
}

/** The team's grade catalogue, sorted by kind then cost. */
export function useGrades() {
  return useSuspenseQuery(getGradesQueryOptions());
}
