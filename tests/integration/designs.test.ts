import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Design, DesignRevision, Run, type User } from "../../server/entities";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeSampleDesign, sampleNetlist } from "./access-samples/designs";

let t: TestContext;
let designer: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let reader: Awaited<ReturnType<TestContext["signedInAgent"]>>;
beforeAll(async () => {
  t = await createTestContext();
  designer = await t.signedInAgent(["designer"]);
  reader = await t.signedInAgent(["reviewer"]);
});
afterAll(() => t?.close());

const counts = async () => ({
  designs: await t.ctx.dataSource.getRepository(Design).count(),
  revisions: await t.ctx.dataSource.getRepository(DesignRevision).count(),
});

async function insertRun(designId: string, revisionId: string, user: User, o: { state: Run["state"]; yieldFraction?: number; finishedAt?: Date }) {
  const id = randomUUID();
  await t.ctx.dataSource.getRepository(Run).insert({
    id, designId, revisionId, limitSetId: null, sweepId: null, label: "", netlist: sampleNetlist(), limits: { rules: [] }, options: {}, gradeOverrides: {},
    lotSize: 1000, bomCost: null, state: o.state, trialsDone: 0, trialsTotal: 100, passed: null, yieldFraction: o.yieldFraction ?? null,
    wilsonLow: o.yieldFraction === undefined ? null : o.yieldFraction - 0.05, wilsonHigh: o.yieldFraction === undefined ? null : o.yieldFraction + 0.03,
    errorCode: null, errorMessage: null, launchedById: user.id, finishedAt: o.finishedAt ?? null,
  });
  return id;
}

describe("designs", () => {
  it("creates a design with revision 1 and a sweep a decade either side of its characteristic frequency", async () => {
    const netlist = sampleNetlist();
    const res = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "  VHF low-pass ", description: "first try", stress: "mains", netlist }).expect(201);
    const { design, revision } = res.body;
    expect(design).toMatchObject({ name: "VHF low-pass", description: "first try", stress: "mains", owner: { id: designer.user.id, name: designer.user.name }, latestYield: null, archivedAt: null });
    expect(design.latestRevision).toEqual({ id: revision.id, number: 1, reviewState: "draft" });
    expect(revision).toMatchObject({ designId: design.id, number: 1, locked: false, parentId: null, netlist });
    // [C] computed: for the 3rd-order Butterworth L = 2R/ωc, C = 1/(Rωc), so √(LC) = √2/ωc and f0 = 100 MHz/√2 = 70.71 MHz;
    // from = f0/10 and to = 10·f0 rounded to 2 significant digits.
    const f0 = 100e6 / Math.SQRT2;
    expect(revision.sweep).toEqual({ from: Number((f0 / 10).toPrecision(2)), to: Number((f0 * 10).toPrecision(2)), points: 201, scale: "log" });
    expect(revision.sweep.from).toBe(7.1e6);
  });

  it("keeps a sweep that is given, and lists designs with the newest finished run's yield", async () => {
    const sweep = { from: 1e6, to: 2e9, points: 101 };
    const res = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "With sweep", netlist: sampleNetlist(), sweep }).expect(201);
    expect(res.body.revision.sweep).toEqual({ ...sweep, scale: "log" });
    const { id } = res.body.design;
    const revisionId = res.body.revision.id;
    await insertRun(id, revisionId, designer.user, { state: "done", yieldFraction: 0.8, finishedAt: new Date(Date.now() - 60_000) });
    const newest = await insertRun(id, revisionId, designer.user, { state: "done", yieldFraction: 0.9, finishedAt: new Date() });
    await insertRun(id, revisionId, designer.user, { state: "queued" });
    const list = await reader.agent.get("/api/designs").expect(200);
    const row = list.body.designs.find((d: { id: string }) => d.id === id);
    expect(row.latestYield.runId).toBe(newest);
    expect(row.latestYield.yield).toBeCloseTo(0.9, 12);
    expect(row.latestYield.wilson95[0]).toBeCloseTo(0.85, 12);
    expect(row.latestYield.wilson95[1]).toBeCloseTo(0.93, 12);
  });

  it("renames and archives; archived designs are listed only with archived=true", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const res = await designer.agent.patch(`/api/designs/${design.id}`).set("Origin", ORIGIN).send({ name: "Renamed", archived: true }).expect(200);
    expect(res.body.design.name).toBe("Renamed");
    expect(res.body.design.archivedAt).not.toBeNull();
    const active = await reader.agent.get("/api/designs").expect(200);
    expect(active.body.designs.map((d: { id: string }) => d.id)).not.toContain(design.id);
    const archived = await reader.agent.get("/api/designs?archived=true").expect(200);
    expect(archived.body.designs.map((d: { id: string }) => d.id)).toContain(design.id);
    await designer.agent.patch(`/api/designs/${design.id}`).set("Origin", ORIGIN).send({ archived: false }).expect(200);
    const bad = await reader.agent.get("/api/designs?archived=maybe").expect(400);
    expect(bad.body.error.fields).toEqual({ archived: "archived must be true or false" });
  });

  it("rejects bad bodies with 400 and field paths, storing nothing", async () => {
    const before = await counts();
    const netlist = sampleNetlist();
    netlist.parts[1].value = -1;
    const shape = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "", netlist, stress: "loud" }).expect(400);
    expect(shape.body.error.code).toBe("VALIDATION_FAILED");
    expect(shape.body.error.fields).toMatchObject({ name: "name is required", stress: expect.any(String), "netlist.parts[1].value": "value must be > 0" });
    const dup = sampleNetlist();
    dup.parts[2].ref = "C1";
    const semantic = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "Dup", netlist: dup }).expect(400);
    expect(semantic.body.error.code).toBe("INVALID_NETLIST");
    expect(Object.keys(semantic.body.error.fields)).toEqual(["netlist.parts[2].ref"]);
    expect(semantic.body.error.message).toMatch(/^netlist\.parts\[2\]\.ref: part C1: duplicate ref/);
    const sweep = await designer.agent.post("/api/designs").set("Origin", ORIGIN).send({ name: "Sweep", netlist: sampleNetlist(), sweep: { from: 5e6, to: 1e6, points: 10 } }).expect(400);
    expect(sweep.body.error.fields).toEqual({ "sweep.to": "sweep needs from < to" });
    expect(await counts()).toEqual(before);
  });

  it("shows a design page with revisions newest first; 404 for an unknown id", async () => {
    const { design, revision } = await makeSampleDesign(t, designer.user);
    await designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist: sampleNetlist(), note: "r2" }).expect(201);
    const res = await reader.agent.get(`/api/designs/${design.id}`).expect(200);
    expect(res.body.design.id).toBe(design.id);
    expect(res.body.design.latestRevision.number).toBe(2);
    expect(res.body.revisions.map((r: { number: number }) => r.number)).toEqual([2, 1]);
    expect(res.body.revisions[0]).toMatchObject({ note: "r2", parentId: revision.id, locked: false, createdBy: { id: designer.user.id, name: designer.user.name } });
    expect(res.body.revisions[0].netlist).toBeUndefined();
    expect(res.body.limitSets).toEqual([]);
    expect(res.body.measured).toEqual([]);
    const missing = await reader.agent.get(`/api/designs/${randomUUID()}`).expect(404);
    expect(missing.body.error.code).toBe("NOT_FOUND");
  });
});

describe("revisions", () => {
  it("adds the next revision from the newest one, inheriting its sweep; a parent from another design is refused", async () => {
    const { design, revision } = await makeSampleDesign(t, designer.user);
    const netlist = sampleNetlist();
    netlist.parts[0].value = 33e-12;
    const second = await designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist, note: "C1 to 33 pF" }).expect(201);
    expect(second.body.revision).toMatchObject({ number: 2, parentId: revision.id, note: "C1 to 33 pF", sweep: revision.sweep, reviewState: "draft" });
    const third = await designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist, parentId: revision.id }).expect(201);
    expect(third.body.revision).toMatchObject({ number: 3, parentId: revision.id });
    const read = await reader.agent.get(`/api/revisions/${second.body.revision.id}`).expect(200);
    expect(read.body.revision.netlist.parts[0].value).toBe(33e-12);

    const other = await makeSampleDesign(t, designer.user);
    const before = await counts();
    const foreign = await designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist, parentId: other.revision.id }).expect(400);
    expect(foreign.body.error.fields).toEqual({ parentId: "not a revision of this design" });
    const floating = sampleNetlist();
    floating.parts.push({ ref: "C9", kind: "C", nodes: ["x", "y"], value: 1e-12 });
    const bad = await designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist: floating }).expect(400);
    expect(Object.keys(bad.body.error.fields)).toEqual(["netlist.parts[3].nodes"]);
    expect(await counts()).toEqual(before);
  });

  it("edits an unlocked revision in place and answers 409 REVISION_LOCKED once a run uses it", async () => {
    const { design, revision } = await makeSampleDesign(t, designer.user);
    const netlist = sampleNetlist();
    netlist.parts[1].value = 150e-9;
    const put = await designer.agent.put(`/api/revisions/${revision.id}`).set("Origin", ORIGIN).send({ netlist, note: "L2 to E12" }).expect(200);
    expect(put.body.revision).toMatchObject({ id: revision.id, number: 1, note: "L2 to E12", sweep: revision.sweep });
    expect(put.body.revision.netlist.parts[1].value).toBe(150e-9);

    await insertRun(design.id, revision.id, designer.user, { state: "queued" });
    const changed = sampleNetlist();
    const locked = await designer.agent.put(`/api/revisions/${revision.id}`).set("Origin", ORIGIN).send({ netlist: changed }).expect(409);
    expect(locked.body.error.code).toBe("REVISION_LOCKED");
    expect(locked.body.error.message).toMatch(/new revision from this one/);
    const stored = await t.ctx.dataSource.getRepository(DesignRevision).findOneByOrFail({ id: revision.id });
    expect(stored.netlist.parts[1].value).toBe(150e-9);

    const flagged = await makeSampleDesign(t, designer.user);
    await t.ctx.dataSource.getRepository(DesignRevision).update({ id: flagged.revision.id }, { locked: true });
    await designer.agent.put(`/api/revisions/${flagged.revision.id}`).set("Origin", ORIGIN).send({ netlist: changed }).expect(409);
    const copy = await designer.agent.post(`/api/designs/${flagged.design.id}/revisions`).set("Origin", ORIGIN).send({ netlist: changed, parentId: flagged.revision.id }).expect(201);
    expect(copy.body.revision).toMatchObject({ number: 2, locked: false, parentId: flagged.revision.id });
    await designer.agent.put(`/api/revisions/${randomUUID()}`).set("Origin", ORIGIN).send({ netlist: changed }).expect(404);
  });

  it("gives concurrent saves consecutive numbers", async () => {
    const { design } = await makeSampleDesign(t, designer.user);
    const saves = await Promise.all([1, 2, 3].map(() => designer.agent.post(`/api/designs/${design.id}/revisions`).set("Origin", ORIGIN).send({ netlist: sampleNetlist() })));
    expect(saves.map((s) => s.status)).toEqual([201, 201, 201]);
    expect(saves.map((s) => s.body.revision.number).sort()).toEqual([2, 3, 4]);
  });
});
