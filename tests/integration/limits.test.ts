import { randomUUID } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Grade, LimitSet } from "../../server/entities";
import { createTestContext, ORIGIN, type TestContext } from "../helpers/test-context";
import { makeSampleDesign, sampleLimits } from "./access-samples/designs";

let t: TestContext;
let planner: Awaited<ReturnType<TestContext["signedInAgent"]>>;
let reader: Awaited<ReturnType<TestContext["signedInAgent"]>>;
beforeAll(async () => {
  t = await createTestContext();
  planner = await t.signedInAgent(["planner"]);
  reader = await t.signedInAgent(["analyst"]);
});
afterAll(() => t?.close());

const limitSetCount = () => t.ctx.dataSource.getRepository(LimitSet).count();
const gradeCount = () => t.ctx.dataSource.getRepository(Grade).count();

describe("limit sets", () => {
  it("creates, lists, replaces and deletes a design's limit sets", async () => {
    const { design } = await makeSampleDesign(t, planner.user);
    const limits = sampleLimits();
    const made = await planner.agent.post(`/api/designs/${design.id}/limit-sets`).set("Origin", ORIGIN).send({ name: "Harmonic mask", limits, lotSize: 2000 }).expect(201);
    expect(made.body.limitSet).toMatchObject({ designId: design.id, name: "Harmonic mask", limits, lotSize: 2000 });
    const list = await reader.agent.get(`/api/designs/${design.id}/limit-sets`).expect(200);
    expect(list.body.limitSets.map((l: { id: string }) => l.id)).toEqual([made.body.limitSet.id]);
    const page = await reader.agent.get(`/api/designs/${design.id}`).expect(200);
    expect(page.body.limitSets).toEqual([expect.objectContaining({ id: made.body.limitSet.id, name: "Harmonic mask", lotSize: 2000, ruleCount: 2 })]);

    const tighter = { rules: [{ metric: "s11_db", from: 1e6, to: 60e6, max: -14, label: "match" }] };
    const put = await planner.agent.put(`/api/limit-sets/${made.body.limitSet.id}`).set("Origin", ORIGIN).send({ name: "Match only", limits: tighter, lotSize: 500 }).expect(200);
    expect(put.body.limitSet).toMatchObject({ id: made.body.limitSet.id, name: "Match only", limits: tighter, lotSize: 500 });
    await planner.agent.delete(`/api/limit-sets/${made.body.limitSet.id}`).set("Origin", ORIGIN).expect(204);
    await planner.agent.delete(`/api/limit-sets/${made.body.limitSet.id}`).set("Origin", ORIGIN).expect(404);
    await reader.agent.get(`/api/designs/${randomUUID()}/limit-sets`).expect(404);
  });

  it("rejects bad limits with field paths (shape by zod, ports by the engine), storing nothing", async () => {
    const { design } = await makeSampleDesign(t, planner.user);
    const before = await limitSetCount();
    const post = (body: unknown) => planner.agent.post(`/api/designs/${design.id}/limit-sets`).set("Origin", ORIGIN).send(body as object);
    const shape = await post({ name: "", lotSize: 0, limits: { rules: [{ metric: "s21_db", from: 2e6, to: 1e6, min: -1 }, { metric: "volume", from: 1, to: 2 }] } }).expect(400);
    expect(shape.body.error.code).toBe("VALIDATION_FAILED");
    expect(shape.body.error.fields).toMatchObject({
      name: "name is required", lotSize: "lotSize must be ≥ 1", "limits.rules[0].to": "band must have from < to", "limits.rules[1].metric": expect.stringMatching(/^unknown metric/),
    });
    // the sample design is a two-port: a rule on S31 names a port it does not have
    const ports = await post({ name: "Three ports", lotSize: 10, limits: { rules: [sampleLimits().rules[0], { metric: "s31_db", from: 1e6, to: 2e6, max: -20 }] } }).expect(400);
    expect(ports.body.error.code).toBe("INVALID_LIMITS");
    expect(Object.keys(ports.body.error.fields)).toEqual(["limits.rules[1].metric"]);
    expect(ports.body.error.message).toMatch(/^limits\.rules\[1\]\.metric: /);
    expect(await limitSetCount()).toBe(before);

    const good = await post({ name: "Good", limits: sampleLimits(), lotSize: 10 }).expect(201);
    const bad = await planner.agent.put(`/api/limit-sets/${good.body.limitSet.id}`).set("Origin", ORIGIN).send({ name: "Bad", limits: { rules: [{ metric: "s33_db", from: 1, to: 2, max: 0 }] }, lotSize: 10 }).expect(400);
    expect(bad.body.error.code).toBe("INVALID_LIMITS");
    const stored = await t.ctx.dataSource.getRepository(LimitSet).findOneByOrFail({ id: good.body.limitSet.id });
    expect(stored.name).toBe("Good");
  });
});

describe("grades", () => {
  it("keeps a catalogue sorted by kind then cost, with 409 on a duplicate kind and code", async () => {
    const add = (body: object) => planner.agent.post("/api/grades").set("Origin", ORIGIN).send(body);
    const j = await add({ kind: "L", code: "J", label: "±5 %", tolerance: 0.05, costEach: 0.11 }).expect(201);
    await add({ kind: "L", code: "G", label: "±2 %", tolerance: 0.02, costEach: 0.21, distribution: "uniform" }).expect(201);
    await add({ kind: "C", code: "C", label: "±0.25 pF", toleranceAbs: 0.25e-12, costEach: 0.031 }).expect(201);
    expect(j.body.grade).toMatchObject({ kind: "L", code: "J", tolerance: 0.05, toleranceAbs: null, distribution: "normal", costEach: 0.11 });
    const list = await reader.agent.get("/api/grades").expect(200);
    expect(list.body.grades.map((g: { kind: string; code: string }) => `${g.kind}:${g.code}`)).toEqual(["C:C", "L:J", "L:G"]);

    const before = await gradeCount();
    const dup = await add({ kind: "L", code: "J", label: "again", tolerance: 0.05, costEach: 0.1 }).expect(409);
    expect(dup.body.error).toMatchObject({ code: "GRADE_EXISTS", fields: { code: 'There is already a L grade with code "J".' } });
    const missing = await add({ kind: "R", code: "F", label: "no tolerance", costEach: 0.01 }).expect(400);
    expect(missing.body.error.fields).toEqual({ tolerance: "needs tolerance and/or toleranceAbs" });
    const badKind = await add({ kind: "X", code: "F", label: "x", tolerance: 0.01, costEach: -1 }).expect(400);
    expect(Object.keys(badKind.body.error.fields).sort()).toEqual(["costEach", "kind"]);
    expect(await gradeCount()).toBe(before);

    const renamed = await planner.agent.put(`/api/grades/${j.body.grade.id}`).set("Origin", ORIGIN).send({ kind: "L", code: "J", label: "±5 % wirewound", tolerance: 0.05, costEach: 0.09 }).expect(200);
    expect(renamed.body.grade).toMatchObject({ id: j.body.grade.id, label: "±5 % wirewound", costEach: 0.09 });
    const clash = await planner.agent.put(`/api/grades/${j.body.grade.id}`).set("Origin", ORIGIN).send({ kind: "L", code: "G", label: "clash", tolerance: 0.02, costEach: 0.2 }).expect(409);
    expect(clash.body.error.code).toBe("GRADE_EXISTS");
    await planner.agent.delete(`/api/grades/${j.body.grade.id}`).set("Origin", ORIGIN).expect(204);
    await planner.agent.delete(`/api/grades/${j.body.grade.id}`).set("Origin", ORIGIN).expect(404);
    await planner.agent.put(`/api/grades/${j.body.grade.id}`).set("Origin", ORIGIN).send({ kind: "L", code: "Z", label: "z", tolerance: 0.2, costEach: 0 }).expect(404);
  });
});
