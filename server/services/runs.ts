/**
 * Launching and reading runs. A run copies its inputs (netlist after grade and tolerance overrides,
 * limits, lot size, engine options with the seed), so it can be re-run or replayed exactly later.
 */
import { randomInt, randomUUID } from "node:crypto";
import type { AppContext } from "../context";
import { Design, DesignRevision, Grade, LimitSet, Run, RunResultRow, User } from "../entities";
import { AppError, notFound } from "../errors";
import { presentRunDetail, runEconomics } from "../presenters/run.presenter";
import { EngineError } from "../../shared/engine/errors";
import type { Netlist, Part } from "../../shared/engine/netlist";
import type { RunOptions } from "../../shared/engine/run-options";
import { shapeRun } from "../../shared/engine/run-plan";
import { checkRunCost, runLimits, shapeCost, type CostShape } from "./run-limits";
import { MAX_API_SEED, type CreateRunInput } from "../../shared/schemas/run-request";

let lastQueuedMs = 0;
/** Strictly increasing queue times (ms precision in the database), so "oldest first" is well defined for a burst of runs. */
function nextQueuedAt(): Date {
  lastQueuedMs = Math.max(Date.now(), lastQueuedMs + 1);
  return new Date(lastQueuedMs);
}

/**
 * Applies grade overrides (the grade's tolerance, toleranceAbs and distribution replace the part's;
 * part.grade = code), then tolerance overrides (a tolerance alone drops an absolute tolerance, which
 * would otherwise win), to a copy of the netlist.
 * @throws AppError VALIDATION_FAILED naming `gradeOverrides.<ref>` / `toleranceOverrides.<ref>`
 */
export function applyOverrides(netlist: Netlist, grades: Grade[], input: Pick<CreateRunInput, "gradeOverrides" | "toleranceOverrides">): Netlist {
  const copy: Netlist = structuredClone(netlist);
  const byRef = new Map(copy.parts.map((p) => [p.ref, p]));
  const fields: Record<string, string> = {};
  for (const [ref, code] of Object.entries(input.gradeOverrides ?? {})) {
    const part = byRef.get(ref);
    if (!part) { fields[`gradeOverrides.${ref}`] = `no part ${ref} in this revision`; continue; }
    const grade = grades.find((g) => g.kind === part.kind && g.code === code);
    if (!grade) { fields[`gradeOverrides.${ref}`] = `no ${part.kind} grade "${code}" in the catalogue`; continue; }
    setTolerance(part, grade.tolerance ?? undefined, grade.toleranceAbs ?? undefined);
    part.distribution = grade.distribution;
    part.grade = grade.code;
  }
  for (const [ref, o] of Object.entries(input.toleranceOverrides ?? {})) {
    const part = byRef.get(ref);
    if (!part) { fields[`toleranceOverrides.${ref}`] = `no part ${ref} in this revision`; continue; }
    setTolerance(part, o.tolerance ?? (o.toleranceAbs !== undefined ? part.tolerance : undefined), o.toleranceAbs);
  }
  if (Object.keys(fields).length) {
    const [path, message] = Object.entries(fields)[0];
    throw new AppError("VALIDATION_FAILED", `${path}: ${message}`, { fields });
  }
  return copy;
}

function setTolerance(part: Part, tolerance: number | undefined, toleranceAbs: number | undefined): void {
  if (tolerance === undefined) delete part.tolerance;
  else part.tolerance = tolerance;
  if (toleranceAbs === undefined) delete part.toleranceAbs;
  else part.toleranceAbs = toleranceAbs;
}

/** Σ cost each of every part's grade (looked up by kind and code); parts without a known grade cost 0. */
export function bomCostOf(netlist: Netlist, grades: Grade[]): number {
  const cost = new Map(grades.map((g) => [`${g.kind}:${g.code}`, g.costEach]));
  return netlist.parts.reduce((sum, p) => sum + (p.grade ? cost.get(`${p.kind}:${p.grade}`) ?? 0 : 0), 0);
}

/**
 * Engine checks before anything is stored: circuit, limits, options, grid and the tolerance model (an absolute
 * tolerance as large as the value, …), so nothing is accepted that a worker would later refuse. A circuit whose
 * nominal solution is singular is accepted: the run itself fails with the reason. Returns the shape that sets the
 * run's cost.
 */
function checkRunInputs(netlist: Netlist, limits: unknown, options: RunOptions): CostShape {
  try {
    return shapeCost(shapeRun(netlist, limits, options));
  } catch (err) {
    if (!(err instanceof EngineError)) throw err;
    const where = err.code === "INVALID_NETLIST" ? "netlist" : err.code === "INVALID_LIMITS" ? "limits" : "";
    const field = [where, err.path].filter(Boolean).join(".") || "body";
    throw new AppError(err.code === "INVALID_NETLIST" || err.code === "INVALID_LIMITS" ? err.code : "INVALID_INPUT", err.message, { fields: { [field]: err.message } });
  }
}

/**
 * Stores a queued run of a revision against a limit set and locks the revision; the queue picks it up.
 * @throws AppError NOT_FOUND (revision, limit set), VALIDATION_FAILED (overrides, a limit set of another design), engine input errors as 400
 */
export async function createRun(ctx: AppContext, user: { id: string; name: string }, input: CreateRunInput, owned: { sweepId?: string } = {}): Promise<Run> {
  const limitSet = await ctx.dataSource.getRepository(LimitSet).findOneBy({ id: input.limitSetId });
  const grades = await ctx.dataSource.getRepository(Grade).find();
  const computeLimits = await runLimits(ctx);
  // The revision is read under its row lock, in the transaction that locks it and stores the run: an edit of the
  // revision (which takes the same lock) is either before (the run copies the new values) or refused after.
  // Taking the exclusive lock first also keeps two launches from deadlocking on the run insert's foreign-key check.
  return ctx.dataSource.transaction(async (m) => {
    const revision = await m.getRepository(DesignRevision).createQueryBuilder("r").setLock("pessimistic_write").where("r.id = :id", { id: input.revisionId }).getOne();
    if (!revision) throw notFound("The revision");
    if (!limitSet) throw notFound("The limit set");
    if (limitSet.designId !== revision.designId) {
      throw new AppError("VALIDATION_FAILED", "limitSetId: the limit set belongs to another design", { fields: { limitSetId: "belongs to another design" } });
    }
    const netlist = applyOverrides(revision.netlist, grades, input);
    const options: RunOptions = { trials: input.trials, seed: input.seed ?? randomInt(0, MAX_API_SEED + 1) };
    if (revision.sweep && typeof revision.sweep === "object") options.sweep = { ...revision.sweep };
    if (input.corners) options.corners = input.corners.slice();
    if (input.targetHalfWidth !== undefined) options.targetHalfWidth = input.targetHalfWidth;
    checkRunCost(checkRunInputs(netlist, limitSet.limits, options), computeLimits);

    const run = m.getRepository(Run).create({
      id: randomUUID(),
      designId: revision.designId,
      revisionId: revision.id,
      limitSetId: limitSet.id,
      sweepId: owned.sweepId ?? null,
      label: input.label ?? "",
      netlist,
      limits: structuredClone(limitSet.limits),
      options: options as unknown as Record<string, unknown>,
      gradeOverrides: { ...(input.gradeOverrides ?? {}) },
      lotSize: limitSet.lotSize,
      bomCost: bomCostOf(netlist, grades),
      state: "queued",
      trialsDone: 0,
      trialsTotal: input.trials,
      passed: null, yieldFraction: null, wilsonLow: null, wilsonHigh: null, errorCode: null, errorMessage: null,
      launchedById: user.id,
      queuedAt: nextQueuedAt(),
      startedAt: null,
      finishedAt: null,
      interruptions: 0,
      lastInterruptedAt: null,
    });
    if (!revision.locked) await m.getRepository(DesignRevision).update({ id: revision.id }, { locked: true });
    await m.getRepository(Run).save(run);
    return run;
  }).then((run) => {
    ctx.runQueue.kick();
    return run;
  });
}

/** A run with its design, revision and launcher, or 404. */
export async function findRun(ctx: AppContext, id: string): Promise<Run & { design: Design; revision: DesignRevision; launchedBy: User }> {
  const run = await ctx.dataSource.getRepository(Run).findOne({ where: { id }, relations: { design: true, revision: true, launchedBy: true } });
  if (!run) throw notFound("The run");
  return run;
}

/** The few columns a progress stream needs (not the run's JSON inputs), or null. */
export function runProgressRow(ctx: AppContext, id: string): Promise<Pick<Run, "id" | "state" | "trialsDone" | "trialsTotal"> | null> {
  return ctx.dataSource.getRepository(Run).findOne({ where: { id }, select: { id: true, state: true, trialsDone: true, trialsTotal: true } });
}

/** GET /api/runs/:id body. */
export async function runDetail(ctx: AppContext, id: string) {
  const run = await findRun(ctx, id);
  const row = run.state === "done" ? await ctx.dataSource.getRepository(RunResultRow).findOneBy({ runId: id }) : null;
  const live = ctx.runQueue.live(id);
  if (live) run.trialsDone = Math.max(run.trialsDone, live.trialsDone);
  return { run: presentRunDetail(run), result: row?.result ?? null, economics: runEconomics(run) };
}
