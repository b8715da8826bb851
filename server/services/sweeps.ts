import { randomInt, randomUUID } from "node:crypto";
import { In } from "typeorm";
import type { AuthUser } from "../auth/sessions";
import type { AppContext } from "../context";
import { Design, DesignRevision, Grade, GradeSweep, LimitSet, Run } from "../entities";
import { AppError, notFound } from "../errors";
import { runEconomics } from "../presenters/run.presenter";
import { runSummaries } from "./history";
import { createRun } from "./runs";
import type { SweepRow } from "../../shared/contracts/runs";
import type { CreateSweepInput } from "../../shared/schemas/review";

/** Seeds are drawn from 0..2^31−1 when the analyst gives none (all runs of the sweep share it). */
const SEED_LIMIT = 2 ** 31;

/** One line of a sweep's results table: the API contract's row (shared/contracts/runs.ts). */
export type { SweepRow };

/**
 * The sweep's table and its pick: among finished runs whose Wilson lower bound meets the target yield (so the
 * target holds with 95 % confidence, not just on the point estimate), the one with the lowest cost per good unit;
 * ties go to the higher lower bound, then to the earlier row. Null when no run meets the target.
 */
export function sweepTable(targetYield: number, runs: Run[]): { rows: SweepRow[]; cheapestMeetingTarget: string | null } {
  const rows = runs.map((run): SweepRow => {
    const wilson95 = run.wilsonLow !== null && run.wilsonHigh !== null ? ([run.wilsonLow, run.wilsonHigh] as [number, number]) : null;
    return {
      runId: run.id,
      label: run.label,
      state: run.state,
      yield: run.yieldFraction,
      wilson95,
      bomCost: run.bomCost,
      costPerGoodUnit: runEconomics(run)?.costPerGoodUnit ?? null,
      meetsTarget: run.state === "done" && wilson95 !== null && wilson95[0] >= targetYield,
    };
  });
  let best: SweepRow | null = null;
  for (const row of rows) {
    if (!row.meetsTarget || row.costPerGoodUnit === null) continue;
    const better = !best || row.costPerGoodUnit < best.costPerGoodUnit! || (row.costPerGoodUnit === best.costPerGoodUnit && row.wilson95![0] > best.wilson95![0]);
    if (better) best = row;
  }
  return { rows, cheapestMeetingTarget: best?.runId ?? null };
}

/**
 * Checks every assignment before anything is stored: each part ref exists in the revision and each grade code
 * exists in the catalogue for that part's kind (400 naming `assignments[i].gradeOverrides.REF`).
 */
async function checkAssignments(ctx: AppContext, revision: DesignRevision, assignments: CreateSweepInput["assignments"]): Promise<void> {
  const kinds = new Map(revision.netlist.parts.map((p) => [p.ref, p.kind]));
  const codes = [...new Set(assignments.flatMap((a) => Object.values(a.gradeOverrides)))];
  const grades = codes.length ? await ctx.dataSource.getRepository(Grade).findBy({ code: In(codes) }) : [];
  const known = new Set(grades.map((g) => `${g.kind}:${g.code}`));
  const fields: Record<string, string> = {};
  assignments.forEach((a, i) => {
    for (const [ref, code] of Object.entries(a.gradeOverrides)) {
      const kind = kinds.get(ref);
      const path = `assignments[${i}].gradeOverrides.${ref}`;
      if (!kind) fields[path] = `revision r${revision.number} has no part ${ref}`;
      else if (!known.has(`${kind}:${code}`)) fields[path] = `no ${kind} grade "${code}" in the catalogue`;
    }
  });
  const first = Object.entries(fields)[0];
  if (first) throw new AppError("VALIDATION_FAILED", `${first[0]}: ${first[1]}`, { fields });
}

/**
 * Starts a grade sweep: one run per assignment through createRun, all with the same seed so every assignment
 * sees the same random deviations (common random numbers: the differences are the grades', not the draw's).
 * If a run cannot be created, the runs made so far are cancelled and removed with the sweep, and the error is passed on.
 */
export async function createSweep(ctx: AppContext, user: AuthUser, input: CreateSweepInput) {
  const revision = await ctx.dataSource.getRepository(DesignRevision).findOneBy({ id: input.revisionId });
  if (!revision) throw new AppError("NOT_FOUND", "That revision was not found.", { fields: { revisionId: "no such revision" } });
  const limitSet = await ctx.dataSource.getRepository(LimitSet).findOneBy({ id: input.limitSetId });
  if (!limitSet || limitSet.designId !== revision.designId) {
    throw new AppError("VALIDATION_FAILED", "limitSetId: not a limit set of this revision's design", { fields: { limitSetId: "not a limit set of this revision's design" } });
  }
  await checkAssignments(ctx, revision, input.assignments);
  const design = await ctx.dataSource.getRepository(Design).findOneByOrFail({ id: revision.designId });

  const seed = input.seed ?? randomInt(0, SEED_LIMIT);
  const sweep: GradeSweep = ctx.dataSource.getRepository(GradeSweep).create({
    id: randomUUID(),
    designId: revision.designId,
    revisionId: revision.id,
    name: input.name ?? `Grade sweep of ${design.name} r${revision.number}`,
    targetYield: input.targetYield,
    createdById: user.id,
  });
  await ctx.dataSource.getRepository(GradeSweep).insert(sweep);

  const runIds: string[] = [];
  try {
    for (const a of input.assignments) {
      const run = await createRun(ctx, user, { revisionId: revision.id, limitSetId: limitSet.id, trials: input.trials, seed, gradeOverrides: a.gradeOverrides, label: a.label }, { sweepId: sweep.id });
      runIds.push(run.id);
    }
  } catch (error) {
    for (const id of runIds) await ctx.runQueue.cancel(id).catch(() => false);
    if (runIds.length) await ctx.dataSource.getRepository(Run).delete({ id: In(runIds) });
    await ctx.dataSource.getRepository(GradeSweep).delete({ id: sweep.id });
    throw error;
  }
  const summaries = await runSummaries(ctx, runIds);
  return { sweep, seed, runs: runIds.map((id) => summaries.get(id)!) };
}

/** A sweep with its results table (runs in launch order). */
export async function getSweep(ctx: AppContext, sweepId: string) {
  const sweep = await ctx.dataSource.getRepository(GradeSweep).findOneBy({ id: sweepId });
  if (!sweep) throw notFound("That grade sweep");
  const runs = await ctx.dataSource.getRepository(Run).find({
    where: { sweepId },
    select: { id: true, label: true, state: true, yieldFraction: true, wilsonLow: true, wilsonHigh: true, bomCost: true, lotSize: true, queuedAt: true },
    order: { queuedAt: "ASC", label: "ASC" },
  });
  return { sweep, ...sweepTable(sweep.targetYield, runs) };
}
