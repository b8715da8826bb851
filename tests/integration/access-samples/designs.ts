import { randomUUID } from "node:crypto";
import { Grade, MeasuredResponse, type User } from "../../../server/entities";
import { createDesign } from "../../../server/services/designs";
import { createLimitSet } from "../../../server/services/limit-sets";
import type { Netlist } from "../../../shared/engine/netlist";
import { synthesizeLadder } from "../../../shared/engine/synthesis/index";
import type { TestContext } from "../../helpers/test-context";
import type { SampleTable } from "./types";

// Fixtures for the design/limit tests and samples, created through the services (the roles are not in the way).

let seq = 0;

/** 3rd-order Butterworth low-pass, 100 MHz, 50 Ω (C1 31.8 pF, L2 159 nH, C3 31.8 pF), ±5 % parts. */
export function sampleNetlist(): Netlist {
  const n = synthesizeLadder({ family: "butterworth", type: "lowpass", order: 3, cutoff: 100e6 });
  return { ...n, parts: n.parts.map((p) => ({ ...p, tolerance: 0.05 })) };
}

/** The same parts as a Lotwise parts table. */
export const SAMPLE_CSV = "ref,kind,node1,node2,value,tolerance\nC1,C,n1,gnd,33p,J\nL2,L,n1,n2,150n,J\nC3,C,n2,gnd,33p,J\n";

/** A two-port Touchstone v1.1 file, 3 frequencies (a matched through with a little loss). */
export const SAMPLE_S2P = "! Lotwise sample\n# MHz S DB R 50\n10 -30 0 -0.1 -10 -0.1 -10 -30 0\n100 -25 0 -0.5 -90 -0.5 -90 -25 0\n1000 -3 0 -20 -170 -20 -170 -3 0\n";

export const sampleLimits = () => ({ rules: [{ metric: "s21_db", from: 1e6, to: 60e6, min: -1, label: "passband" }, { metric: "s21_db", from: 300e6, to: 1e9, max: -20 }] });

export async function makeSampleDesign(t: TestContext, owner: User, name = `Sample low-pass ${++seq}`) {
  return createDesign(t.ctx, owner, { name, netlist: sampleNetlist() });
}

export async function makeSampleLimitSet(t: TestContext, owner: User) {
  const { design } = await makeSampleDesign(t, owner);
  return createLimitSet(t.ctx, owner, design.id, { name: `Mask ${++seq}`, limits: sampleLimits(), lotSize: 1000 });
}

export async function makeSampleMeasured(t: TestContext, owner: User) {
  const { design } = await makeSampleDesign(t, owner);
  const row = { id: randomUUID(), designId: design.id, name: "bench", fileName: "bench.s2p", data: { freqs: [1e7, 1e8], ports: 2, z0: [50, 50], s: new Array(16).fill(0.1) }, uploadedById: owner.id };
  await t.ctx.dataSource.getRepository(MeasuredResponse).insert(row);
  return row;
}

export async function makeSampleGrade(t: TestContext) {
  const row = { id: randomUUID(), kind: "C" as const, code: `S${++seq}`, label: "sample", tolerance: 0.05, toleranceAbs: null, distribution: "normal" as const, costEach: 0.01 };
  await t.ctx.dataSource.getRepository(Grade).insert(row);
  return row;
}

/** Sample requests for the routes in server/routes/designs.routes.ts and limits.routes.ts. */
export const designsSamples: SampleTable = {
  "get /designs": async () => ({ path: "/api/designs?archived=false" }),
  "post /designs": async () => ({ path: "/api/designs", body: { name: `Posted ${++seq}`, netlist: sampleNetlist() } }),
  "get /designs/:id": async (t, caller) => ({ path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}` }),
  "patch /designs/:id": async (t, caller) => ({ path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}`, body: { name: `Renamed ${++seq}`, archived: true } }),
  "get /revisions/:id": async (t, caller) => ({ path: `/api/revisions/${(await makeSampleDesign(t, caller)).revision.id}` }),
  "post /designs/:id/revisions": async (t, caller) => ({ path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}/revisions`, body: { netlist: sampleNetlist(), note: "next" } }),
  "put /revisions/:id": async (t, caller) => ({ path: `/api/revisions/${(await makeSampleDesign(t, caller)).revision.id}`, body: { netlist: sampleNetlist(), note: "edited" } }),
  "post /designs/:id/revisions/upload": async (t, caller) => ({
    path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}/revisions/upload`,
    files: { file: { content: SAMPLE_CSV, filename: "parts.csv" } },
    fields: { note: "from the bench" },
  }),
  "post /designs/:id/measured": async (t, caller) => ({
    path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}/measured`,
    files: { file: { content: SAMPLE_S2P, filename: "unit-7.s2p" } },
    fields: { name: "unit 7" },
  }),
  "get /measured/:id": async (t, caller) => ({ path: `/api/measured/${(await makeSampleMeasured(t, caller)).id}` }),
  "delete /measured/:id": async (t, caller) => ({ path: `/api/measured/${(await makeSampleMeasured(t, caller)).id}` }),
  "get /designs/:id/limit-sets": async (t, caller) => ({ path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}/limit-sets` }),
  "post /designs/:id/limit-sets": async (t, caller) => ({
    path: `/api/designs/${(await makeSampleDesign(t, caller)).design.id}/limit-sets`,
    body: { name: "Mask", limits: sampleLimits(), lotSize: 500 },
  }),
  "put /limit-sets/:id": async (t, caller) => ({ path: `/api/limit-sets/${(await makeSampleLimitSet(t, caller)).id}`, body: { name: "Mask v2", limits: sampleLimits(), lotSize: 800 } }),
  "delete /limit-sets/:id": async (t, caller) => ({ path: `/api/limit-sets/${(await makeSampleLimitSet(t, caller)).id}` }),
  "get /grades": async () => ({ path: "/api/grades" }),
  "post /grades": async () => ({ path: "/api/grades", body: { kind: "L", code: `P${++seq}`, label: "posted", tolerance: 0.02, costEach: 0.1 } }),
  "put /grades/:id": async (t) => ({ path: `/api/grades/${(await makeSampleGrade(t)).id}`, body: { kind: "C", code: `U${++seq}`, label: "updated", toleranceAbs: 0.25e-12, costEach: 0.02 } }),
  "delete /grades/:id": async (t) => ({ path: `/api/grades/${(await makeSampleGrade(t)).id}` }),
};
