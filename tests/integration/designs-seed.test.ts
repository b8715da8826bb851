import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { Design, DesignRevision, Grade, LimitSet } from "../../server/entities";
import { seedDemoDesigns } from "../../server/seed/demo-designs";
import { compileNetlist } from "../../shared/engine/solver";
import { validateLimits } from "../../shared/engine/limits";
import { prototypeValues } from "../../shared/engine/synthesis/index";
import { createTestContext, type TestContext } from "../helpers/test-context";

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t?.close());

describe("demo designs seed", () => {
  it("adds the three demo designs with limit sets and the grade catalogue, once", async () => {
    const designer = await t.buildUser({ roles: ["designer"] });
    const planner = await t.buildUser({ roles: ["planner"] });
    const first = await seedDemoDesigns(t.ctx.dataSource, { designer: designer.id, planner: planner.id });
    expect(first.designsAdded).toBe(3);
    expect(first.gradesAdded).toBe(14);
    const again = await seedDemoDesigns(t.ctx.dataSource, { designer: designer.id, planner: planner.id });
    expect(again).toMatchObject({ designsAdded: 0, gradesAdded: 0 });
    expect(again.designs).toEqual(first.designs);
    expect(await t.ctx.dataSource.getRepository(Design).count()).toBe(3);
    expect(await t.ctx.dataSource.getRepository(DesignRevision).count()).toBe(3);
    expect(await t.ctx.dataSource.getRepository(LimitSet).count()).toBe(3);
    expect(await t.ctx.dataSource.getRepository(Grade).count()).toBe(14);
  });

  it("snaps the harmonic low-pass to E24", async () => {
    const design = await t.ctx.dataSource.getRepository(Design).findOneByOrFail({ name: "VHF harmonic low-pass" });
    const revision = await t.ctx.dataSource.getRepository(DesignRevision).findOneByOrFail({ designId: design.id });
    const parts = revision.netlist.parts;
    // Ideal values from the 0.1 dB Chebyshev prototype, n = 7 (tests/fixtures/generators/lowpass_prototypes.py; docs/references.md §1.2 [C]: g1 = 1.1812, g2 = 1.4228,
    // g3 = 2.0967, g4 = 1.5734), C = g/(R0·ωc), L = g·R0/ωc at 175 MHz, 50 Ω:
    // C1 = 21.48 pF → E24 22 pF, L2 = 64.70 nH → E24 62 nH (below √(62·68) = 64.93), C3 = 38.14 pF → 39 pF,
    // L4 = 71.55 nH → 75 nH (above √(68·75) = 71.41).
    const wc = 2 * Math.PI * 175e6;
    const { g } = prototypeValues("chebyshev", 7, 0.1);
    expect(g.slice(0, 4).map((v) => Number(v.toFixed(4)))).toEqual([1.1812, 1.4228, 2.0967, 1.5734]);
    const ideal = [g[0] / (50 * wc), (g[1] * 50) / wc, g[2] / (50 * wc), (g[3] * 50) / wc];
    expect(ideal.map((v) => Number(v.toPrecision(4)))).toEqual([21.48e-12, 64.7e-9, 38.14e-12, 71.55e-9]);
    expect(parts.map((p) => [p.ref, p.value])).toEqual([
      ["C1", 22e-12], ["L2", 62e-9], ["C3", 39e-12], ["L4", 75e-9], ["C5", 39e-12], ["L6", 62e-9], ["C7", 22e-12],
    ]);
    expect(parts.filter((p) => p.kind === "C").every((p) => p.tolerance === 0.02 && p.grade === "G" && p.series === "E24")).toBe(true);
    expect(parts.filter((p) => p.kind === "L").every((p) => p.tolerance === 0.05 && p.grade === "J" && p.series === "E24")).toBe(true);
    expect(() => compileNetlist(revision.netlist)).not.toThrow();
    const [mask] = await t.ctx.dataSource.getRepository(LimitSet).findBy({ designId: design.id });
    expect(mask).toMatchObject({ name: "Harmonic mask", lotSize: 2000 });
    expect(validateLimits(mask.limits, revision.netlist.ports.length).map((r) => [r.metric, r.from, r.to, r.min ?? null, r.max ?? null])).toEqual([
      ["s21_db", 144e6, 174e6, -1, null], ["s21_db", 288e6, 800e6, null, -35], ["s11_db", 144e6, 174e6, null, -10],
    ]);
  });

  it("grades follow IEC 60062 letters (B ±0.1 pF, C ±0.25 pF, F ±1 %, G ±2 %, J ±5 %, K ±10 %)", async () => {
    const grades = await t.ctx.dataSource.getRepository(Grade).find();
    const by = (kind: string, code: string) => grades.find((g) => g.kind === kind && g.code === code)!;
    expect(by("C", "B").toleranceAbs).toBeCloseTo(0.1e-12, 20);
    expect(by("C", "C").toleranceAbs).toBeCloseTo(0.25e-12, 20);
    expect([by("C", "F").tolerance, by("C", "G").tolerance, by("C", "J").tolerance]).toEqual([0.01, 0.02, 0.05]);
    expect([by("L", "G").tolerance, by("L", "J").tolerance, by("L", "K").tolerance]).toEqual([0.02, 0.05, 0.1]);
    expect([by("R", "F").tolerance, by("R", "J").tolerance]).toEqual([0.01, 0.05]);
    // a tighter grade costs more within a kind
    expect(by("C", "B").costEach).toBeGreaterThan(by("C", "J").costEach);
    expect(by("L", "G").costEach).toBeGreaterThan(by("L", "K").costEach);
  });
});
