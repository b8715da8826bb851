/**
 * Designs and their revisions. A revision's netlist is checked twice before anything is written: its JSON shape
 * (zod, at the route) and its meaning (compileNetlist: duplicate refs, floating nodes…). A revision that a run
 * references is locked: it is never changed again, only copied into a new revision.
 */
import { randomUUID } from "node:crypto";
import { In, type EntityManager } from "typeorm";
import type { AuthUser } from "../auth/sessions";
import type { AppContext } from "../context";
import { Design, DesignRevision, LimitSet, MeasuredResponse, Run } from "../entities";
import type { SweepSetting } from "../entities/design-revision.entity";
import { DEFAULT_STRESS_CLASS } from "../../shared/contracts/vocabulary";
import type { StressClass } from "../entities/design.entity";
import { AppError, notFound } from "../errors";
import { REVIEW_STATE_WORDS } from "../../shared/contracts/vocabulary";
import {
  presentDesign, presentLimitSetSummary, presentMeasuredSummary, presentRevisionSummary, type LatestRevisionView, type LatestYieldView,
} from "../presenters/design.presenter";
import { compileSampling } from "../../shared/engine/sampling";
import { compileNetlist } from "../../shared/engine/solver";
import { isEngineError } from "../../shared/engine/errors";
import type { Netlist } from "../../shared/engine/netlist";
import type { CreateDesignInput, UpdateDesignInput } from "../../shared/schemas/design";

// VARIABLES //

/** Used when a netlist has neither L nor C to estimate a characteristic frequency from. */
export const FALLBACK_SWEEP: SweepSetting = { from: 1e6, to: 1e9, points: 201, scale: "log" };

// TYPES //

export interface RevisionInput {
  netlist: Netlist;
  sweep?: { from: number; to: number; points: number; scale?: "log" | "lin" };
  note?: string;
  parentId?: string;
}

// MAIN //

/**
 * The sweep a new revision gets when none is given: 201 log points over a decade either side of the netlist's
 * characteristic frequency f0 = 1/(2π·√(L̄·C̄)), with L̄ and C̄ the geometric means of its inductors and capacitors
 * (R0/(2π·L̄) or 1/(2π·R0·C̄) with R0 the geometric mean of the port z0 when one kind is missing). Edges rounded
 * to 2 significant digits.
 * @example defaultSweep(synthesizeLadder({ family: "butterworth", type: "lowpass", order: 3, cutoff: 100e6 }))
 * // → { from: 7.1e6, to: 7.1e8, points: 201, scale: "log" }  (f0 = 1/(2π√(159 nH·31.8 pF)) = fc/√2 ≈ 70.7 MHz)
 */
export function defaultSweep(netlist: Netlist): SweepSetting {
  const geo = (xs: number[]) => Math.exp(xs.reduce((a, x) => a + Math.log(x), 0) / xs.length);
  const ls = netlist.parts.filter((p) => p.kind === "L").map((p) => p.value);
  const cs = netlist.parts.filter((p) => p.kind === "C").map((p) => p.value);
  const r0 = geo(netlist.ports.map((p) => p.z0));
  const f0 = ls.length && cs.length ? 1 / (2 * Math.PI * Math.sqrt(geo(ls) * geo(cs))) : ls.length ? r0 / (2 * Math.PI * geo(ls)) : cs.length ? 1 / (2 * Math.PI * r0 * geo(cs)) : NaN;
  if (!Number.isFinite(f0) || f0 <= 0) return { ...FALLBACK_SWEEP };
  const round = (x: number) => Number(x.toPrecision(2));
  return { from: round(f0 / 10), to: round(f0 * 10), points: 201, scale: "log" };
}

/**
 * Semantic check of a netlist: the circuit (compileNetlist) and its tolerance model (compileSampling: an absolute
 * tolerance must be smaller than the value, …), so nothing is stored that a run would later refuse. An EngineError
 * becomes 400 INVALID_NETLIST with the field `<prefix>.<engine path>`, e.g. `netlist.parts[2].value`.
 */
export function checkNetlist(netlist: Netlist, prefix = "netlist"): void {
  try {
    compileNetlist(netlist);
    compileSampling(netlist);
  } catch (error) {
    if (!isEngineError(error)) throw error;
    const field = error.path ? `${prefix}.${error.path}` : prefix;
    throw new AppError("INVALID_NETLIST", `${field}: ${error.message}`, { fields: { [field]: error.message } });
  }
}

/** Designs as the designs table shows them (owner, newest revision, newest finished run's yield), newest change first. */
export async function listDesigns(ctx: AppContext, archived: boolean) {
  const designs = await ctx.dataSource.getRepository(Design).createQueryBuilder("d").leftJoinAndSelect("d.owner", "owner")
    .where(archived ? "d.archived_at IS NOT NULL" : "d.archived_at IS NULL").orderBy("d.updated_at", "DESC").getMany();
  return designViews(ctx, designs);
}

/** Presents designs with their newest revision and newest finished run (two queries for any number of designs). */
export async function designViews(ctx: AppContext, designs: Design[]) {
  if (designs.length === 0) return [];
  const ids = designs.map((d) => d.id);
  const revisions = await ctx.dataSource.getRepository(DesignRevision).find({
    select: { id: true, designId: true, number: true, reviewState: true }, where: { designId: In(ids) }, order: { number: "DESC" },
  });
  const runs = await ctx.dataSource.getRepository(Run).find({
    select: { id: true, designId: true, yieldFraction: true, wilsonLow: true, wilsonHigh: true, finishedAt: true },
    where: { designId: In(ids), state: "done" }, order: { finishedAt: "DESC", queuedAt: "DESC" },
  });
  const latestRevision = new Map<string, LatestRevisionView>();
  for (const r of revisions) if (!latestRevision.has(r.designId)) latestRevision.set(r.designId, { id: r.id, number: r.number, reviewState: r.reviewState });
  const latestYield = new Map<string, LatestYieldView>();
  for (const r of runs) {
    if (latestYield.has(r.designId) || r.yieldFraction === null) continue;
    latestYield.set(r.designId, { runId: r.id, yield: r.yieldFraction, wilson95: [r.wilsonLow ?? 0, r.wilsonHigh ?? 1] });
  }
  return designs.map((d) => presentDesign(d, { latestRevision: latestRevision.get(d.id) ?? null, latestYield: latestYield.get(d.id) ?? null }));
}

/** One design with its owner (404 when missing). */
export async function findDesign(ctx: AppContext | EntityManager, id: string): Promise<Design> {
  const manager = "dataSource" in ctx ? ctx.dataSource.manager : ctx;
  const design = await manager.getRepository(Design).findOne({ where: { id }, relations: { owner: true } });
  if (!design) throw notFound("That design");
  return design;
}

/** Creates a design and its revision 1 in one transaction (the netlist is checked first). */
export async function createDesign(ctx: AppContext, user: AuthUser, input: CreateDesignInput): Promise<{ design: Design; revision: DesignRevision }> {
  const netlist = input.netlist as Netlist;
  checkNetlist(netlist);
  const sweep = input.sweep ? { scale: "log" as const, ...input.sweep } : defaultSweep(netlist);
  const designId = randomUUID();
  const revisionId = randomUUID();
  await ctx.dataSource.transaction(async (m) => {
    await m.getRepository(Design).insert({ id: designId, name: input.name, description: input.description ?? "", stress: (input.stress ?? DEFAULT_STRESS_CLASS) as StressClass, ownerId: user.id, archivedAt: null });
    await m.getRepository(DesignRevision).insert({ id: revisionId, designId, number: 1, netlist, sweep, note: "", parentId: null, reviewState: "draft", locked: false, createdById: user.id });
  });
  return { design: await findDesign(ctx, designId), revision: await findRevision(ctx, revisionId) };
}

/** The design page: design, revisions (newest first, no netlists), limit sets and measured responses. */
export async function designDetail(ctx: AppContext, id: string) {
  const design = await findDesign(ctx, id);
  const [view] = await designViews(ctx, [design]);
  const revisions = await ctx.dataSource.getRepository(DesignRevision).find({
    select: { id: true, designId: true, number: true, note: true, reviewState: true, locked: true, parentId: true, createdAt: true, createdById: true, createdBy: { id: true, name: true } },
    where: { designId: id }, relations: { createdBy: true }, order: { number: "DESC" },
  });
  const limitSets = await ctx.dataSource.getRepository(LimitSet).find({ where: { designId: id }, order: { name: "ASC" } });
  const measured: { id: string; name: string; file_name: string; points: string | number | null; created_at: Date }[] = await ctx.dataSource.query(
    "SELECT id, name, file_name, JSON_LENGTH(data, '$.freqs') AS points, created_at FROM measured_response WHERE design_id = ? ORDER BY created_at DESC",
    [id],
  );
  return {
    design: view,
    revisions: revisions.map(presentRevisionSummary),
    limitSets: limitSets.map(presentLimitSetSummary),
    measured: measured.map((m) => presentMeasuredSummary({ id: m.id, name: m.name, fileName: m.file_name, createdAt: new Date(m.created_at) }, Number(m.points ?? 0))),
  };
}

/** Renames, re-describes, re-classes or (un)archives a design. */
export async function updateDesign(ctx: AppContext, id: string, input: UpdateDesignInput): Promise<Design> {
  const design = await findDesign(ctx, id);
  const changes: Partial<Design> = {};
  if (input.name !== undefined) changes.name = input.name;
  if (input.description !== undefined) changes.description = input.description;
  if (input.stress !== undefined) changes.stress = input.stress as StressClass;
  if (input.archived !== undefined) changes.archivedAt = input.archived ? (design.archivedAt ?? new Date()) : null;
  if (Object.keys(changes).length > 0) await ctx.dataSource.getRepository(Design).update({ id }, changes);
  return findDesign(ctx, id);
}

/** One revision with its author (404 when missing). */
export async function findRevision(ctx: AppContext, id: string): Promise<DesignRevision> {
  const revision = await ctx.dataSource.getRepository(DesignRevision).findOne({ where: { id }, relations: { createdBy: true } });
  if (!revision) throw notFound("That revision");
  return revision;
}

/** The newest revision of a design (every design has one). */
export async function latestRevision(ctx: AppContext, designId: string): Promise<DesignRevision> {
  const revision = await ctx.dataSource.getRepository(DesignRevision).findOne({ where: { designId }, order: { number: "DESC" } });
  if (!revision) throw notFound("A revision of that design");
  return revision;
}

/**
 * Adds the next revision of a design. The parent (default: the newest revision) must belong to the design; the
 * sweep defaults to the parent's. The design row is locked while the number is taken, so two saves at once get
 * consecutive numbers; the design's updatedAt moves in the same transaction.
 */
export async function addRevision(ctx: AppContext, user: AuthUser, designId: string, input: RevisionInput): Promise<DesignRevision> {
  checkNetlist(input.netlist);
  await findDesign(ctx, designId);
  const parent = input.parentId
    ? await ctx.dataSource.getRepository(DesignRevision).findOneBy({ id: input.parentId, designId })
    : await latestRevision(ctx, designId);
  if (!parent) throw new AppError("VALIDATION_FAILED", "parentId: not a revision of this design", { fields: { parentId: "not a revision of this design" } });
  const id = randomUUID();
  await ctx.dataSource.transaction(async (m) => {
    await m.getRepository(Design).createQueryBuilder("d").setLock("pessimistic_write").where("d.id = :designId", { designId }).getOneOrFail();
    const top = await m.getRepository(DesignRevision).createQueryBuilder("r").select("MAX(r.number)", "max").where("r.design_id = :designId", { designId }).getRawOne<{ max: number | null }>();
    const sweep = input.sweep ? { scale: "log" as const, ...input.sweep } : parent.sweep;
    await m.getRepository(DesignRevision).insert({
      id, designId, number: Number(top?.max ?? 0) + 1, netlist: input.netlist, sweep, note: input.note ?? "", parentId: parent.id, reviewState: "draft", locked: false, createdById: user.id,
    });
    await m.getRepository(Design).update({ id: designId }, { updatedAt: new Date() });
  });
  return findRevision(ctx, id);
}

/**
 * Replaces a draft revision's netlist (and sweep/note when given). 409 REVISION_LOCKED once a run references it:
 * the row is locked for the check and the write, so a run created meanwhile cannot slip in between.
 */
export async function replaceRevision(ctx: AppContext, id: string, input: Omit<RevisionInput, "parentId">): Promise<DesignRevision> {
  checkNetlist(input.netlist);
  await ctx.dataSource.transaction(async (m) => {
    const revision = await m.getRepository(DesignRevision).createQueryBuilder("r").setLock("pessimistic_write").where("r.id = :id", { id }).getOne();
    if (!revision) throw notFound("That revision");
    if (revision.reviewState !== "draft") {
      throw new AppError("REVISION_LOCKED", `Revision ${revision.number} is frozen because it is ${REVIEW_STATE_WORDS[revision.reviewState]}; make a new revision from this one.`);
    }
    if (revision.locked || (await m.getRepository(Run).existsBy({ revisionId: id }))) {
      throw new AppError("REVISION_LOCKED", `Revision ${revision.number} is locked because a run uses it; make a new revision from this one.`);
    }
    const changes: Partial<DesignRevision> = { netlist: input.netlist };
    if (input.sweep) changes.sweep = { scale: "log", ...input.sweep };
    if (input.note !== undefined) changes.note = input.note;
    await m.getRepository(DesignRevision).update({ id }, changes);
    await m.getRepository(Design).update({ id: revision.designId }, { updatedAt: new Date() });
  });
  return findRevision(ctx, id);
}

/** Stores a measured response of a design (already parsed from its Touchstone upload). */
export async function addMeasured(ctx: AppContext, m: Omit<MeasuredResponse, "id" | "createdAt" | "design" | "uploadedBy">): Promise<MeasuredResponse> {
  const measured = ctx.dataSource.getRepository(MeasuredResponse).create({ id: randomUUID(), ...m });
  await ctx.dataSource.getRepository(MeasuredResponse).insert(measured);
  return measured;
}

/** Removes a measured response. @throws AppError 404 */
export async function deleteMeasured(ctx: AppContext, id: string): Promise<void> {
  const result = await ctx.dataSource.getRepository(MeasuredResponse).delete({ id });
  if (result.affected !== 1) throw notFound("That measured response");
}

/** A measured response (404 when missing). */
export async function findMeasured(ctx: AppContext, id: string): Promise<MeasuredResponse> {
  const measured = await ctx.dataSource.getRepository(MeasuredResponse).findOneBy({ id });
  if (!measured) throw notFound("That measured response");
  return measured;
}
