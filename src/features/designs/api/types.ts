import type { Netlist } from "@shared/engine/netlist";

/** How the filter is used; mains and high-power RF get a safety caution. */
export type StressClass = "small-signal" | "mains" | "high-power-rf";
export const STRESS_CLASSES: readonly StressClass[] = ["small-signal", "mains", "high-power-rf"];
export const STRESS_LABELS: Record<StressClass, string> = {
  "small-signal": "Small signal",
  mains: "Mains-connected",
  "high-power-rf": "High-power RF",
};

export type ReviewState = "draft" | "in-review" | "approved" | "changes-requested";

/** Default sweep of a revision's nominal plot (Hz). */
export type SweepSetting = { from: number; to: number; points: number; scale: "log" | "lin" };

export type PersonRef = { id: string; name: string };

export type Design = {
  id: string;
  name: string;
  description: string;
  stress: StressClass;
  owner: PersonRef;
  latestRevision: { id: string; number: number; reviewState: ReviewState } | null;
  latestYield: { runId: string; yield: number; wilson95: [number, number] } | null;
  updatedAt: string;
  archivedAt: string | null;
};

export type RevisionSummary = {
  id: string;
  number: number;
  note: string;
  reviewState: ReviewState;
  locked: boolean;
  parentId: string | null;
  createdAt: string;
  createdBy: PersonRef;
};

export type Revision = RevisionSummary & { designId: string; netlist: Netlist; sweep: SweepSetting };

export type LimitSetSummary = { id: string; name: string; lotSize: number; ruleCount: number; updatedAt: string };

export type MeasuredSummary = { id: string; name: string; fileName: string; points: number; createdAt: string };

export type DesignDetail = {
  design: Design;
  revisions: RevisionSummary[];
  limitSets: LimitSetSummary[];
  measured: MeasuredSummary[];
};

export type Measured = {
  id: string;
  designId: string;
  name: string;
  fileName: string;
  data: { freqs: number[]; ports: number; z0: number[]; sDb: { s11: number[]; s21?: number[]; s12?: number[]; s22?: number[] } };
};

export const DEFAULT_SWEEP: SweepSetting = { from: 1e6, to: 1e9, points: 201, scale: "log" };
