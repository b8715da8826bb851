import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";
import type { NetlistJson, PersonRef } from "@/features/runs/api/types";

// Read-only views of the design data a run needs (designs, revisions, limit sets, grades, measured curves).

export type Stress = "small-signal" | "mains" | "high-power-rf";
export type DesignListItem = { id: string; name: string; stress: Stress; latestRevision: { id: string; number: number; reviewState: string } | null };
export type DesignDetail = {
  design: { id: string; name: string; description: string; stress: Stress; owner?: PersonRef };
  revisions: { id: string; number: number; note: string; reviewState: string; locked: boolean; createdAt: string; createdBy: PersonRef }[];
  limitSets: { id: string; name: string; lotSize: number; ruleCount: number }[];
  measured: { id: string; name: string; fileName: string; points: number }[];
};
export type Revision = { id: string; designId: string; number: number; netlist: NetlistJson; reviewState: string; locked: boolean };
export type Grade = { id: string; kind: "R" | "L" | "C"; code: string; label: string; tolerance: number | null; toleranceAbs: number | null; distribution: string | null; costEach: number };
export type Measured = { id: string; name: string; data: { freqs: number[]; sDb: Record<string, number[] | undefined> } };

const enc = encodeURIComponent;

export function getDesignsQueryOptions() {
  return queryOptions({
    queryKey: ["designs", "list", { archived: false }] as const,
    queryFn: async () => (await api.get<{ designs: DesignListItem[] }>("/designs?archived=false")).designs,
  });
}

export function getDesignQueryOptions(designId: string) {
  return queryOptions({ queryKey: ["designs", "detail", designId] as const, queryFn: () => api.get<DesignDetail>(`/designs/${enc(designId)}`) });
}

export function getRevisionQueryOptions(revisionId: string) {
  return queryOptions({
    queryKey: ["revisions", "detail", revisionId] as const,
    queryFn: async () => (await api.get<{ revision: Revision }>(`/revisions/${enc(revisionId)}`)).revision,
  });
}

export function getGradesQueryOptions() {
  return queryOptions({ queryKey: ["grades"] as const, queryFn: async () => (await api.get<{ grades: Grade[] }>("/grades")).grades });
}

export function getMeasuredQueryOptions(measuredId: string) {
  return queryOptions({
    queryKey: ["measured", measuredId] as const,
    queryFn: async () => (await api.get<{ measured: Measured }>(`/measured/${enc(measuredId)}`)).measured,
    staleTime: Infinity,
  });
}

export const useDesigns = () => useSuspenseQuery(getDesignsQueryOptions());
export const useDesign = (designId: string) => useSuspenseQuery(getDesignQueryOptions(designId));
export const useGrades = () => useSuspenseQuery(getGradesQueryOptions());
/** Non-suspending: the pickers render while the revision loads. */
export const useRevision = (revisionId: string | null) =>
  useQuery({ ...getRevisionQueryOptions(revisionId ?? ""), enabled: Boolean(revisionId) });
export const useMeasured = (measuredId: string | null) =>
  useQuery({ ...getMeasuredQueryOptions(measuredId ?? ""), enabled: Boolean(measuredId) });
