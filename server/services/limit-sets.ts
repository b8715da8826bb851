/**
 * Acceptance limit sets (per design) and the team's grade catalogue. Limits are checked against the port count of
 * the design's newest revision (validateLimits) before they are stored; runs keep their own copy, so editing or
 * deleting a limit set never changes a stored run.
 */
import { randomUUID } from "node:crypto";
import type { AuthUser } from "../auth/sessions";
import type { AppContext } from "../context";
import { Grade, LimitSet } from "../entities";
import { AppError, notFound } from "../errors";
import { isEngineError } from "../../shared/engine/errors";
import { validateLimits, type Limits } from "../../shared/engine/limits";
import type { GradeBodyInput, LimitSetBodyInput } from "../../shared/schemas/design";
import { findDesign, latestRevision } from "./designs";

/** 400 INVALID_LIMITS naming `limits.rules[k].field` when a rule names a port the design does not have. */
export async function checkLimits(ctx: AppContext, designId: string, limits: Limits): Promise<void> {
  const revision = await latestRevision(ctx, designId);
  try {
    validateLimits(limits, revision.netlist.ports.length);
  } catch (error) {
    if (!isEngineError(error)) throw error;
    const field = `limits.${error.path ?? "rules"}`;
    throw new AppError("INVALID_LIMITS", `${field}: ${error.message}`, { fields: { [field]: error.message } });
  }
}

export async function listLimitSets(ctx: AppContext, designId: string): Promise<LimitSet[]> {
  await findDesign(ctx, designId);
  return ctx.dataSource.getRepository(LimitSet).find({ where: { designId }, order: { name: "ASC", createdAt: "ASC" } });
}

export async function findLimitSet(ctx: AppContext, id: string): Promise<LimitSet> {
  const limitSet = await ctx.dataSource.getRepository(LimitSet).findOneBy({ id });
  if (!limitSet) throw notFound("That limit set");
  return limitSet;
}

export async function createLimitSet(ctx: AppContext, user: AuthUser, designId: string, input: LimitSetBodyInput): Promise<LimitSet> {
  await findDesign(ctx, designId);
  await checkLimits(ctx, designId, input.limits);
  const id = randomUUID();
  await ctx.dataSource.getRepository(LimitSet).insert({ id, designId, name: input.name, limits: input.limits, lotSize: input.lotSize, createdById: user.id });
  return findLimitSet(ctx, id);
}

export async function updateLimitSet(ctx: AppContext, id: string, input: LimitSetBodyInput): Promise<LimitSet> {
  const limitSet = await findLimitSet(ctx, id);
  await checkLimits(ctx, limitSet.designId, input.limits);
  await ctx.dataSource.getRepository(LimitSet).update({ id }, { name: input.name, limits: input.limits, lotSize: input.lotSize });
  return findLimitSet(ctx, id);
}

export async function deleteLimitSet(ctx: AppContext, id: string): Promise<void> {
  const result = await ctx.dataSource.getRepository(LimitSet).delete({ id });
  if (result.affected !== 1) throw notFound("That limit set");
}

/** The catalogue sorted by kind, then cost each, then code. */
export async function listGrades(ctx: AppContext): Promise<Grade[]> {
  return ctx.dataSource.getRepository(Grade).find({ order: { kind: "ASC", costEach: "ASC", code: "ASC" } });
}

export async function findGrade(ctx: AppContext, id: string): Promise<Grade> {
  const grade = await ctx.dataSource.getRepository(Grade).findOneBy({ id });
  if (!grade) throw notFound("That grade");
  return grade;
}

/** Adds a grade; 409 GRADE_EXISTS when the kind already has that code. */
export async function createGrade(ctx: AppContext, input: GradeBodyInput): Promise<Grade> {
  const id = randomUUID();
  await guardDuplicate(ctx, null, input, () => ctx.dataSource.getRepository(Grade).insert({ id, ...gradeColumns(input) }));
  return findGrade(ctx, id);
}

export async function updateGrade(ctx: AppContext, id: string, input: GradeBodyInput): Promise<Grade> {
  await findGrade(ctx, id);
  await guardDuplicate(ctx, id, input, () => ctx.dataSource.getRepository(Grade).update({ id }, gradeColumns(input)));
  return findGrade(ctx, id);
}

export async function deleteGrade(ctx: AppContext, id: string): Promise<void> {
  const result = await ctx.dataSource.getRepository(Grade).delete({ id });
  if (result.affected !== 1) throw notFound("That grade");
}

function gradeColumns(input: GradeBodyInput) {
  return {
    kind: input.kind, code: input.code, label: input.label, tolerance: input.tolerance ?? null, toleranceAbs: input.toleranceAbs ?? null,
    distribution: input.distribution ?? ("normal" as const), costEach: input.costEach,
  };
}

/** 409 GRADE_EXISTS when another grade has the same (kind, code): checked first, and the unique index catches a race. */
async function guardDuplicate(ctx: AppContext, selfId: string | null, input: GradeBodyInput, write: () => Promise<unknown>): Promise<void> {
  const message = `There is already a ${input.kind} grade with code "${input.code}".`;
  const exists = () => new AppError("GRADE_EXISTS", message, { fields: { code: message } });
  const other = await ctx.dataSource.getRepository(Grade).findOneBy({ kind: input.kind, code: input.code });
  if (other && other.id !== selfId) throw exists();
  try {
    await write();
  } catch (error) {
    const code = (error as { code?: string; driverError?: { code?: string } }).driverError?.code ?? (error as { code?: string }).code;
    if (code === "ER_DUP_ENTRY") throw exists();
    throw error;
  }
}
