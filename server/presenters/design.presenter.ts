import type { Design, DesignRevision, Grade, LimitSet, MeasuredResponse, User } from "../entities";
import type {
  DesignView, Grade as GradeView, LimitSet as LimitSetView, LimitSetSummary, Measured, MeasuredSummary, PersonRef, Revision, RevisionSummary,
} from "../../shared/contracts";

// Every presenter answers a type of the API contract (shared/contracts), which the client reads.

/** A person as shown beside a design or revision. */
export const presentPerson = (u: Pick<User, "id" | "name"> | null | undefined, fallbackId: string): PersonRef => ({ id: u?.id ?? fallbackId, name: u?.name ?? "" });

/** Newest revision of a design, as the designs table shows it. */
export type LatestRevisionView = NonNullable<DesignView["latestRevision"]>;

/** Newest finished run of a design: yield and its Wilson 95 % interval. */
export type LatestYieldView = NonNullable<DesignView["latestYield"]>;

export const presentDesign = (d: Design, extra: { owner?: User | null; latestRevision: LatestRevisionView | null; latestYield: LatestYieldView | null }): DesignView => ({
  id: d.id,
  name: d.name,
  description: d.description,
  stress: d.stress,
  owner: presentPerson(extra.owner ?? d.owner, d.ownerId),
  latestRevision: extra.latestRevision,
  latestYield: extra.latestYield,
  createdAt: d.createdAt.toISOString(),
  updatedAt: d.updatedAt.toISOString(),
  archivedAt: d.archivedAt?.toISOString() ?? null,
});

/** A revision without its netlist, for the design page's revision list. */
export const presentRevisionSummary = (r: DesignRevision): RevisionSummary => ({
  id: r.id,
  number: r.number,
  note: r.note,
  reviewState: r.reviewState,
  locked: r.locked,
  parentId: r.parentId,
  createdAt: r.createdAt.toISOString(),
  createdBy: presentPerson(r.createdBy, r.createdById),
});

/** A whole revision, netlist and sweep included. */
export const presentRevision = (r: DesignRevision): Revision => ({
  id: r.id,
  designId: r.designId,
  number: r.number,
  netlist: r.netlist,
  sweep: r.sweep,
  note: r.note,
  reviewState: r.reviewState,
  locked: r.locked,
  parentId: r.parentId,
  createdAt: r.createdAt.toISOString(),
  createdBy: presentPerson(r.createdBy, r.createdById),
});

export const presentLimitSet = (l: LimitSet): LimitSetView => ({
  id: l.id,
  designId: l.designId,
  name: l.name,
  limits: l.limits,
  lotSize: l.lotSize,
  updatedAt: l.updatedAt.toISOString(),
});

export const presentLimitSetSummary = (l: LimitSet): LimitSetSummary => ({
  id: l.id,
  name: l.name,
  lotSize: l.lotSize,
  ruleCount: l.limits?.rules?.length ?? 0,
  updatedAt: l.updatedAt.toISOString(),
});

export const presentGrade = (g: Grade): GradeView => ({
  id: g.id,
  kind: g.kind,
  code: g.code,
  label: g.label,
  tolerance: g.tolerance,
  toleranceAbs: g.toleranceAbs,
  distribution: g.distribution,
  costEach: g.costEach,
});

/** A measured response without its data (the design page's list). */
export const presentMeasuredSummary = (m: Pick<MeasuredResponse, "id" | "name" | "fileName" | "createdAt">, points: number): MeasuredSummary => ({
  id: m.id,
  name: m.name,
  fileName: m.fileName,
  points,
  createdAt: m.createdAt.toISOString(),
});

/**
 * A measured response with |S_ij| in dB per pair, 20·log10|S| (magnitudes below 1e-15 shown as −300 dB).
 * s12/s22 exist for two-port files only; a one-port file has s11 alone.
 */
export const presentMeasured = (m: MeasuredResponse): Measured => {
  const { freqs, ports, z0, s } = m.data;
  const pair = (i: number, j: number) =>
    freqs.map((_, f) => {
      const at = ((f * ports + i) * ports + j) * 2;
      return 20 * Math.log10(Math.max(Math.hypot(s[at], s[at + 1]), 1e-15));
    });
  const sDb: Measured["data"]["sDb"] = { s11: pair(0, 0) };
  if (ports >= 2) Object.assign(sDb, { s21: pair(1, 0), s12: pair(0, 1), s22: pair(1, 1) });
  return { id: m.id, designId: m.designId, name: m.name, fileName: m.fileName, createdAt: m.createdAt.toISOString(), data: { freqs, ports, z0, sDb } };
};
