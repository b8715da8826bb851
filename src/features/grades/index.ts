/** What other features may use of the grades feature: the catalogue's key and query. */
export { gradeKeys } from "@/features/grades/api/keys";
export { getGradesQueryOptions, useGrades } from "@/features/grades/api/get-grades";
