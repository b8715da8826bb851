import { In, type SelectQueryBuilder } from "typeorm";
import type { AppContext } from "../context";
import { Run, RunResultRow } from "../entities";
import { AppError } from "../errors";
import { presentRunSummary, type RunSummary } from "../presenters/run.presenter";
import type { HistoryQuery } from "../../shared/schemas/review";


/** Sort keys of the history → the column (or joined column) they order by. */
const SORT_COLUMNS: Record<HistoryQuery["sort"], string> = {
  queuedAt: "run.queuedAt",
  finishedAt: "run.finishedAt",
  yield: "run.yieldFraction",
  state: "run.state",
  design: "design.name",
};

/**
 * One page of the run history: filters (design, revision, launcher, states, queued-at window, yield range),
 * sorted by one key (runs without that value — no yield yet, not finished — last in either direction),
 * ties broken by newest queued first, then id, so pages never overlap.
 */
export async function listRuns(ctx: AppContext, q: HistoryQuery): Promise<{ runs: RunSummary[]; total: number; page: number; pageSize: number }> {
  const qb = baseQuery(ctx);
  if (q.designId) qb.andWhere("run.designId = :designId", { designId: q.designId });
  if (q.revisionId) qb.andWhere("run.revisionId = :revisionId", { revisionId: q.revisionId });
  if (q.launchedBy) qb.andWhere("run.launchedById = :launchedBy", { launchedBy: q.launchedBy });
  if (q.state) qb.andWhere("run.state IN (:...states)", { states: q.state });
  if (q.from) qb.andWhere("run.queuedAt >= :from", { from: q.from });
  if (q.to) qb.andWhere("run.queuedAt < :to", { to: q.to });
  if (q.minYield !== undefined) qb.andWhere("run.yieldFraction >= :minYield", { minYield: q.minYield });
  if (q.maxYield !== undefined) qb.andWhere("run.yieldFraction <= :maxYield", { maxYield: q.maxYield });

  const total = await qb.clone().getCount();
  const column = SORT_COLUMNS[q.sort];
  const dir = q.dir === "asc" ? "ASC" : "DESC";
  qb.orderBy(`${column} IS NULL`, "ASC").addOrderBy(column, dir);
  if (q.sort !== "queuedAt") qb.addOrderBy("run.queuedAt", "DESC");
  qb.addOrderBy("run.id", "ASC");
  const runs = await qb.offset((q.page - 1) * q.pageSize).limit(q.pageSize).getMany();
  return { runs: runs.map((r) => presentRunSummary(r)), total, page: q.page, pageSize: q.pageSize };
}

/** Several runs side by side, in the order asked, each with its stored result (null until done). 404 names missing ids. */
export async function compareRuns(ctx: AppContext, ids: string[]): Promise<{ runs: { run: RunSummary; result: Record<string, unknown> | null }[] }> {
  const found = await baseQuery(ctx).where("run.id IN (:...ids)", { ids }).getMany();
  const byId = new Map(found.map((r) => [r.id, r]));
  const missing = ids.filter((id) => !byId.has(id));
  if (missing.length) throw new AppError("NOT_FOUND", `No run with id ${missing.join(", ")}.`, { fields: { ids: `unknown: ${missing.join(", ")}` } });
  const results = await ctx.dataSource.getRepository(RunResultRow).findBy({ runId: In(ids) });
  const resultById = new Map(results.map((r) => [r.runId, r.result]));
  return { runs: ids.map((id) => ({ run: presentRunSummary(byId.get(id)!), result: resultById.get(id) ?? null })) };
}

/** RunSummaries of the given runs (any order), for the sweeps table and route answers. */
export async function runSummaries(ctx: AppContext, ids: string[]): Promise<Map<string, RunSummary>> {
  if (!ids.length) return new Map();
  const found = await baseQuery(ctx).where("run.id IN (:...ids)", { ids }).getMany();
  return new Map(found.map((r) => [r.id, presentRunSummary(r)]));
}

/** Run columns a list never shows (large JSON inputs); the detail route reads them. */
const HEAVY_COLUMNS = new Set(["netlist", "limits"]);

/**
 * Runs with what a RunSummary needs (design name, revision number, launcher) and without the heavy JSON
 * inputs. All joins are many-to-one, so LIMIT/OFFSET page rows exactly.
 */
function baseQuery(ctx: AppContext): SelectQueryBuilder<Run> {
  const runColumns = ctx.dataSource
    .getMetadata(Run)
    .columns.map((c) => c.propertyName)
    .filter((name) => !HEAVY_COLUMNS.has(name))
    .map((name) => `run.${name}`);
  return ctx.dataSource
    .getRepository(Run)
    .createQueryBuilder("run")
    .leftJoin("run.design", "design")
    .leftJoin("run.revision", "revision")
    .leftJoin("run.launchedBy", "launchedBy")
    .select([...runColumns, "design.id", "design.name", "revision.id", "revision.number", "launchedBy.id", "launchedBy.name"]);
}
