/**
 * Demo designs of Brackwater Radio Works (invented): a VHF harmonic low-pass and an IF preselector, each with a
 * limit set, plus a grade catalogue. Tolerance letters follow IEC 60062 (B ±0.1 pF, C ±0.25 pF, F ±1 %, G ±2 %,
 * J ±5 %, K ±10 %; docs/references.md §7); every price is invented.
 */
import { randomUUID } from "node:crypto";
import type { DataSource } from "typeorm";
import { Design, DesignRevision, Grade, LimitSet } from "../entities";
import type { SweepSetting } from "../entities/design-revision.entity";
import { DEFAULT_STRESS_CLASS, type StressClass } from "../../shared/contracts/vocabulary";
import { snapToSeries } from "../../shared/engine/e-series";
import type { Limits } from "../../shared/engine/limits";
import type { ESeriesName, Netlist, Part } from "../../shared/engine/netlist";
import { synthesizeLadder, type LadderSpec } from "../../shared/engine/synthesis/index";

// TYPES //

/** Who owns the demo designs (a designer) and who wrote their limit sets (a planner; defaults to the designer). */
export interface DemoOwnerIds {
  designer: string;
  planner?: string;
}

export interface DemoDesignsSummary {
  designsAdded: number;
  gradesAdded: number;
  designs: { name: string; designId: string; revisionId: string; limitSetIds: string[] }[];
}

/** Per kind: the E-series to snap to, the relative tolerance and the grade code. */
type DemoGrading = Record<"C" | "L", [ESeriesName, number, string]>;

/** RF parts: C0G capacitors ±2 % (G), wirewound inductors ±5 % (J), both snapped to E24. */
const RF_GRADING: DemoGrading = { C: ["E24", 0.02, "G"], L: ["E24", 0.05, "J"] };

interface DemoDesign {
  name: string;
  description: string;
  stress?: StressClass;
  grades?: DemoGrading;
  spec: LadderSpec;
  sweep: SweepSetting;
  limitSet: { name: string; lotSize: number; limits: Limits };
}

// VARIABLES //

/** The grade catalogue: [kind, code, label, tolerance, toleranceAbs, costEach]; all normal (tolerance = 3σ). */
const GRADES: ReadonlyArray<[Grade["kind"], string, string, number | null, number | null, number]> = [
  ["C", "B", "C0G/NP0 ±0.1 pF (B)", null, 0.1e-12, 0.052],
  ["C", "C", "C0G/NP0 ±0.25 pF (C)", null, 0.25e-12, 0.031],
  ["C", "F", "C0G/NP0 ±1 % (F)", 0.01, null, 0.024],
  ["C", "G", "C0G/NP0 ±2 % (G)", 0.02, null, 0.016],
  ["C", "J", "C0G/NP0 ±5 % (J)", 0.05, null, 0.008],
  ["L", "G", "Wirewound chip ±2 % (G)", 0.02, null, 0.21],
  ["L", "J", "Wirewound chip ±5 % (J)", 0.05, null, 0.11],
  ["L", "K", "Multilayer chip ±10 % (K)", 0.1, null, 0.035],
  ["C", "K", "X2 film ±10 % (K)", 0.1, null, 0.19],
  ["C", "M", "X2 film ±20 % (M)", 0.2, null, 0.12],
  ["L", "M", "Power choke ±20 % (M)", 0.2, null, 0.42],
  ["L", "N", "Power choke ±30 % (N)", 0.3, null, 0.27],
  ["R", "F", "Thick film ±1 % (F)", 0.01, null, 0.004],
  ["R", "J", "Thick film ±5 % (J)", 0.05, null, 0.002],
];

export const DEMO_DESIGNS: readonly DemoDesign[] = [
  {
    name: "VHF harmonic low-pass",
    description: "Transmitter output low-pass for the marine VHF band: passes 144–174 MHz, stops the 2nd harmonic and up.",
    spec: { family: "chebyshev", type: "lowpass", order: 7, cutoff: 175e6, rippleDb: 0.1, z0: 50 },
    sweep: { from: 10e6, to: 1e9, points: 401, scale: "log" },
    limitSet: {
      name: "Harmonic mask",
      lotSize: 2000,
      limits: {
        rules: [
          { metric: "s21_db", from: 144e6, to: 174e6, min: -1, label: "passband loss" },
          { metric: "s21_db", from: 288e6, to: 800e6, max: -35, label: "harmonic rejection" },
          { metric: "s11_db", from: 144e6, to: 174e6, max: -10, label: "passband match" },
        ],
      },
    },
  },
  {
    name: "Mains input filter",
    description: "Differential-mode low-pass on the 230 V supply input of the shore charger, measured in a 50 Ω system (conducted-emission band 150 kHz–30 MHz).",
    stress: "mains",
    spec: { family: "butterworth", type: "lowpass", order: 3, cutoff: 50e3, z0: 50 },
    sweep: { from: 100, to: 30e6, points: 401, scale: "log" },
    grades: { C: ["E12", 0.2, "M"], L: ["E12", 0.2, "M"] },
    limitSet: {
      name: "Conducted-emission band",
      lotSize: 500,
      limits: {
        rules: [
          { metric: "s21_db", from: 100, to: 5e3, min: -1, label: "supply frequencies pass" },
          { metric: "s21_db", from: 150e3, to: 30e6, max: -20, label: "150 kHz and up" },
        ],
      },
    },
  },
  {
    name: "IF preselector",
    description: "Band-pass ahead of the first IF mixer, 40–50 MHz.",
    spec: { family: "butterworth", type: "bandpass", order: 3, low: 40e6, high: 50e6, z0: 50 },
    sweep: { from: 5e6, to: 500e6, points: 401, scale: "log" },
    limitSet: {
      name: "IF passband",
      lotSize: 5000,
      limits: {
        rules: [
          { metric: "s21_db", from: 42e6, to: 48e6, min: -3, label: "passband loss" },
          { metric: "s21_db", from: 10e6, to: 28e6, max: -25, label: "low-side rejection" },
          { metric: "s21_db", from: 75e6, to: 300e6, max: -25, label: "high-side rejection" },
          { metric: "s11_db", from: 43e6, to: 47e6, max: -10, label: "passband match" },
        ],
      },
    },
  },
];

// MAIN //

/**
 * A demo netlist: the synthesized ladder snapped and graded per kind (RF designs: E24, C ±2 % (G), L ±5 % (J));
 * capacitors of 10 pF and below get C ±0.25 pF, where IEC 60062's absolute letters apply.
 */
export function demoNetlist(spec: LadderSpec, grading: DemoGrading = RF_GRADING): Netlist {
  const ladder = synthesizeLadder(spec);
  const parts = ladder.parts.map((p): Part => {
    const [series, tolerance, grade] = grading[p.kind === "L" ? "L" : "C"];
    const value = Number(snapToSeries(p.value, series).value.toPrecision(6));
    if (p.kind === "C" && value <= 10e-12) return { ...p, value, series, toleranceAbs: 0.25e-12, distribution: "normal", grade: "C" };
    return { ...p, value, series, tolerance, distribution: "normal", grade };
  });
  return { ...ladder, parts };
}

/** Adds the grade catalogue and the demo designs that are missing (by kind+code and by design name); safe to run again. */
export async function seedDemoDesigns(dataSource: DataSource, ownerIds: DemoOwnerIds): Promise<DemoDesignsSummary> {
  const summary: DemoDesignsSummary = { designsAdded: 0, gradesAdded: 0, designs: [] };
  const grades = dataSource.getRepository(Grade);
  for (const [kind, code, label, tolerance, toleranceAbs, costEach] of GRADES) {
    if (await grades.existsBy({ kind, code })) continue;
    await grades.insert({ id: randomUUID(), kind, code, label, tolerance, toleranceAbs, distribution: "normal", costEach });
    summary.gradesAdded += 1;
  }
  for (const demo of DEMO_DESIGNS) {
    const existing = await dataSource.getRepository(Design).findOneBy({ name: demo.name });
    if (existing) {
      const revision = await dataSource.getRepository(DesignRevision).findOneOrFail({ where: { designId: existing.id }, order: { number: "DESC" } });
      const sets = await dataSource.getRepository(LimitSet).find({ where: { designId: existing.id }, order: { createdAt: "ASC" } });
      summary.designs.push({ name: demo.name, designId: existing.id, revisionId: revision.id, limitSetIds: sets.map((s) => s.id) });
      continue;
    }
    const ids = { design: randomUUID(), revision: randomUUID(), limitSet: randomUUID() };
    await dataSource.transaction(async (m) => {
      await m.getRepository(Design).insert({ id: ids.design, name: demo.name, description: demo.description, stress: demo.stress ?? DEFAULT_STRESS_CLASS, ownerId: ownerIds.designer, archivedAt: null });
      await m.getRepository(DesignRevision).insert({
        id: ids.revision, designId: ids.design, number: 1, netlist: demoNetlist(demo.spec, demo.grades), sweep: demo.sweep,
        note: "synthesized from a prototype, snapped to preferred values", parentId: null, reviewState: "draft", locked: false, createdById: ownerIds.designer,
      });
      await m.getRepository(LimitSet).insert({
        id: ids.limitSet, designId: ids.design, name: demo.limitSet.name, limits: demo.limitSet.limits, lotSize: demo.limitSet.lotSize, createdById: ownerIds.planner ?? ownerIds.designer,
      });
    });
    summary.designsAdded += 1;
    summary.designs.push({ name: demo.name, designId: ids.design, revisionId: ids.revision, limitSetIds: [ids.limitSet] });
  }
  return summary;
}
