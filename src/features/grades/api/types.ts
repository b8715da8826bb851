import type { PartKind } from "@shared/engine/netlist";

/** A purchasable tolerance grade of one part kind and its cost each (currency of the team's choice). */
export type Grade = {
  id: string;
  kind: PartKind;
  code: string;
  label: string;
  tolerance: number | null;
  toleranceAbs: number | null;
  distribution: "normal" | "uniform";
  costEach: number;
};

export type GradeInput = Omit<Grade, "id" | "tolerance" | "toleranceAbs"> & { tolerance?: number; toleranceAbs?: number };
