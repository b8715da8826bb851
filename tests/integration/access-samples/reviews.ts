import { randomUUID } from "node:crypto";
import { Design, DesignRevision, Grade, GradeSweep, LimitSet, Run, RunResultRow, type User } from "../../../server/entities";
import type { ReviewState } from "../../../server/entities/design-revision.entity";
import type { RunState } from "../../../server/entities/run.entity";
import type { PartKind } from "../../../shared/engine/netlist";
import { butterLimits, butterworth3 } from "../../fixtures/butterworth3";
import type { TestContext } from "../../helpers/test-context";
import type { SampleTable } from "./types";

// Fixtures for the history / review / sweep tests and samples: rows written straight through the repositories.

let seq = 0;

export interface DesignFixture {
  design: Design;
  revision: DesignRevision;
  limitSet: LimitSet;
}

/** A design (3rd-order Butterworth, ±5 %) with revision 1 (51-point log sweep, 1 MHz–1 GHz) and a limit set. */
export async function makeDesign(t: TestContext, owner: User, o: { name?: string; reviewState?: ReviewState } = {}): Promise<DesignFixture> {
  const ds = t.ctx.dataSource;
  const design = ds.getRepository(Design).create({ id: randomUUID(), name: o.name ?? `Harmonic low-pass ${++seq}`, description: "", stress: "small-signal", ownerId: owner.id });
  await ds.getRepository(Design).insert(design);
  const revision = ds.getRepository(DesignRevision).create({
    id: randomUUID(),
    designId: design.id,
    number: 1,
    netlist: butterworth3(0.05),
    sweep: { from: 1e6, to: 1e9, points: 51, scale: "log" },
    note: "",
    parentId: null,
    reviewState: o.reviewState ?? "draft",
    locked: false,
    createdById: owner.id,
  });
  await ds.getRepository(DesignRevision).insert(revision);
  const limitSet = ds.getRepository(LimitSet).create({ id: randomUUID(), designId: design.id, name: "Acceptance", limits: butterLimits, lotSize: 1000, createdById: owner.id });
  await ds.getRepository(LimitSet).insert(limitSet);
  return { design, revision, limitSet };
}

export interface RunFixture {
  state?: RunState;
  passed?: number | null;
  trials?: number;
  wilson?: [number, number] | null;
  bomCost?: number | null;
  label?: string;
  sweepId?: string | null;
  queuedAt?: Date;
  finishedAt?: Date | null;
  result?: Record<string, unknown>;
}

/** A run row as if the queue had handled it (yield = passed/trials); with `result`, its run_result row too. */
export async function makeRun(t: TestContext, f: DesignFixture, launcher: User, o: RunFixture = {}): Promise<Run> {
  const trials = o.trials ?? 1000;
  const passed = o.passed === undefined ? (o.state === undefined || o.state === "done" ? 950 : null) : o.passed;
  const run = t.ctx.dataSource.getRepository(Run).create({
    id: randomUUID(),
    designId: f.design.id,
    revisionId: f.revision.id,
    limitSetId: f.limitSet.id,
    sweepId: o.sweepId ?? null,
    label: o.label ?? "",
    netlist: f.revision.netlist,
    limits: f.limitSet.limits,
    options: { trials, seed: 7 },
    gradeOverrides: {},
    lotSize: f.limitSet.lotSize,
    bomCost: o.bomCost === undefined ? 1 : o.bomCost,
    state: o.state ?? "done",
    trialsDone: passed === null ? 0 : trials,
    trialsTotal: trials,
    passed,
    yieldFraction: passed === null ? null : passed / trials,
    wilsonLow: o.wilson === undefined ? (passed === null ? null : passed / trials - 0.01) : (o.wilson?.[0] ?? null),
    wilsonHigh: o.wilson === undefined ? (passed === null ? null : Math.min(1, passed / trials + 0.01)) : (o.wilson?.[1] ?? null),
    errorCode: null,
    errorMessage: null,
    launchedById: launcher.id,
    queuedAt: o.queuedAt ?? new Date(Date.now() + ++seq),
    startedAt: null,
    finishedAt: o.finishedAt === undefined ? (passed === null ? null : new Date()) : o.finishedAt,
  });
  // (casts: json columns typed Record<string, unknown> do not fit TypeORM's deep-partial insert type)
  await t.ctx.dataSource.getRepository(Run).insert(run as never);
  if (o.result) await t.ctx.dataSource.getRepository(RunResultRow).insert({ runId: run.id, result: o.result } as never);
  return run;
}

/** Adds a catalogue grade unless (kind, code) exists; returns the stored one. */
export async function makeGrade(t: TestContext, kind: PartKind, code: string, tolerance: number, costEach: number): Promise<Grade> {
  const repo = t.ctx.dataSource.getRepository(Grade);
  const existing = await repo.findOneBy({ kind, code });
  if (existing) return existing;
  const grade = repo.create({ id: randomUUID(), kind, code, label: `${kind} ±${tolerance * 100} %`, tolerance, toleranceAbs: null, distribution: "normal", costEach });
  await repo.insert(grade);
  return grade;
}

/** Sample requests for the routes in server/routes/reviews*.routes.ts. */
export const reviewsSamples: SampleTable = {
  "get /runs": async () => ({ path: "/api/runs?sort=yield&dir=asc&pageSize=5" }),
  "get /runs/compare": async (t, caller) => {
    const f = await makeDesign(t, caller);
    const a = await makeRun(t, f, caller);
    const b = await makeRun(t, f, caller, { state: "queued" });
    return { path: `/api/runs/compare?ids=${a.id},${b.id}` };
  },
  "get /runs/:id/comments": async (t, caller) => ({ path: `/api/runs/${(await makeRun(t, await makeDesign(t, caller), caller)).id}/comments` }),
  "post /runs/:id/comments": async (t, caller) => ({ path: `/api/runs/${(await makeRun(t, await makeDesign(t, caller), caller)).id}/comments`, body: { body: "Looks marginal at 70 MHz." } }),
  "get /revisions/:id/review": async (t, caller) => ({ path: `/api/revisions/${(await makeDesign(t, caller)).revision.id}/review` }),
  // A designer submits a draft for sign-off; a reviewer signs off one already awaiting it.
  "post /revisions/:id/review": async (t, caller) => {
    const asDesigner = caller.roles.includes("designer");
    const f = await makeDesign(t, caller, { reviewState: asDesigner ? "draft" : "awaiting-signoff" });
    return { path: `/api/revisions/${f.revision.id}/review`, body: { action: asDesigner ? "submit" : "sign-off", comment: "sample" } };
  },
  "post /sweeps": async (t, caller) => {
    const f = await makeDesign(t, caller);
    return {
      path: "/api/sweeps",
      body: { revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 5, seed: 1, targetYield: 0.9, assignments: [{ label: "as drawn", gradeOverrides: {} }] },
    };
  },
  "get /sweeps/:id": async (t, caller) => {
    const f = await makeDesign(t, caller);
    const sweep = { id: randomUUID(), designId: f.design.id, revisionId: f.revision.id, name: "sample sweep", targetYield: 0.9, createdById: caller.id };
    await t.ctx.dataSource.getRepository(GradeSweep).insert(sweep);
    await makeRun(t, f, caller, { sweepId: sweep.id, label: "as drawn" });
    return { path: `/api/sweeps/${sweep.id}` };
  },
};
