import { randomUUID } from "node:crypto";
import { Design, DesignRevision, LimitSet, Run, type User } from "../../../server/entities";
import type { SweepSetting } from "../../../server/entities/design-revision.entity";
import type { Limits } from "../../../shared/engine/limits";
import type { Netlist } from "../../../shared/engine/netlist";
import type { TestContext } from "../../helpers/test-context";
import type { SampleTable } from "./types";

/**
 * A 3rd-order Butterworth low-pass, 100 MHz, 50 ohm (g = 1, 2, 1: C = 1/(2π·100 MHz·50 Ω) = 31.83 pF,
 * L = 2·50/(2π·100 MHz) = 159.2 nH), every part ±5 %.
 */
export const LOWPASS: Netlist = {
  name: "Butterworth low-pass, n=3, 100 MHz",
  ports: [{ name: "in", node: "n1", z0: 50 }, { name: "out", node: "n2", z0: 50 }],
  parts: [
    { ref: "C1", kind: "C", nodes: ["n1", "gnd"], value: 3.1830988618379065e-11, tolerance: 0.05 },
    { ref: "L2", kind: "L", nodes: ["n1", "n2"], value: 1.5915494309189535e-7, tolerance: 0.05 },
    { ref: "C3", kind: "C", nodes: ["n2", "gnd"], value: 3.1830988618379065e-11, tolerance: 0.05 },
  ],
};

/** Passband to 85 MHz (nominal loss 1.39 dB) and stopband from 250 MHz (nominal 23.9 dB): some trials fail. */
export const LOWPASS_LIMITS: Limits = {
  rules: [
    { metric: "s21_db", from: 1e6, to: 85e6, min: -1.5, label: "passband" },
    { metric: "s21_db", from: 250e6, to: 1e9, max: -20, label: "stopband" },
  ],
};

export const LOWPASS_SWEEP: SweepSetting = { from: 1e6, to: 1e9, points: 101, scale: "log" };

export interface RunFixture {
  design: Design;
  revision: DesignRevision;
  limitSet: LimitSet;
}

let seq = 0;

/** A design with revision 1 and a limit set, written straight through the repositories. */
export async function makeRunFixture(
  t: TestContext,
  owner: User,
  o: { netlist?: Netlist; limits?: Limits; sweep?: SweepSetting; lotSize?: number; name?: string } = {},
): Promise<RunFixture> {
  const ds = t.ctx.dataSource;
  const design = ds.getRepository(Design).create({ id: randomUUID(), name: o.name ?? `Low-pass ${++seq}`, description: "", stress: "small-signal", ownerId: owner.id, archivedAt: null });
  await ds.getRepository(Design).save(design);
  const revision = ds.getRepository(DesignRevision).create({
    id: randomUUID(), designId: design.id, number: 1, netlist: o.netlist ?? LOWPASS, sweep: o.sweep ?? LOWPASS_SWEEP,
    note: "", parentId: null, reviewState: "draft", locked: false, createdById: owner.id,
  });
  await ds.getRepository(DesignRevision).save(revision);
  const limitSet = ds.getRepository(LimitSet).create({ id: randomUUID(), designId: design.id, name: "acceptance", limits: o.limits ?? LOWPASS_LIMITS, lotSize: o.lotSize ?? 1000, createdById: owner.id });
  await ds.getRepository(LimitSet).save(limitSet);
  return { design, revision, limitSet };
}

/**
 * A run row written directly (no queue): state `running` by default, which no queue picks up (only start()
 * re-queues those), so samples can cancel it; `cancelled` for routes that must answer at once; `done` (all trials
 * counted, no stored result) for the replays and exports, which need a finished run.
 */
export async function insertRun(t: TestContext, caller: User, state: Run["state"] = "running", trials = 20): Promise<Run> {
  const f = await makeRunFixture(t, caller);
  const repo = t.ctx.dataSource.getRepository(Run);
  const run = repo.create({
    id: randomUUID(), designId: f.design.id, revisionId: f.revision.id, limitSetId: f.limitSet.id, sweepId: null, label: "",
    netlist: LOWPASS, limits: LOWPASS_LIMITS, options: { trials, seed: 11, sweep: LOWPASS_SWEEP }, gradeOverrides: {},
    lotSize: 1000, bomCost: 0, state, trialsDone: state === "done" ? trials : 0, trialsTotal: trials, passed: null, yieldFraction: null, wilsonLow: null,
    wilsonHigh: null, errorCode: null, errorMessage: null, launchedById: caller.id, queuedAt: new Date(), startedAt: null,
    finishedAt: state === "running" ? null : new Date(),
  });
  await repo.save(run);
  return run;
}

/** Sample requests for the routes in server/routes/runs*.routes.ts. */
export const runsSamples: SampleTable = {
  "post /runs": async (t, caller) => {
    const f = await makeRunFixture(t, caller);
    return { path: "/api/runs", body: { revisionId: f.revision.id, limitSetId: f.limitSet.id, trials: 20, seed: 3 } };
  },
  "get /runs/:id": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "cancelled")).id}` }),
  "get /runs/:id/events": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "cancelled")).id}/events` }),
  "post /runs/:id/cancel": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "running")).id}/cancel` }),
  "get /runs/:id/trials.csv": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "done")).id}/trials.csv` }),
  "get /runs/:id/nominal.s2p": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "cancelled")).id}/nominal.s2p` }),
  "get /runs/:id/trials/:index.s2p": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "done")).id}/trials/3.s2p` }),
  "get /runs/:id/trials/:index": async (t, caller) => ({ path: `/api/runs/${(await insertRun(t, caller, "done")).id}/trials/3` }),
};
