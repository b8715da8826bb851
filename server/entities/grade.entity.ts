import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from "typeorm";
import type { Distribution } from "../../shared/contracts/vocabulary";
import type { PartKind } from "../../shared/engine/netlist";

/** An entry of the team's grade catalogue: a purchasable tolerance grade of one part kind, and its cost each. */
@Entity({ name: "grade" })
@Index("IDX_GRADE_KIND_CODE", ["kind", "code"], { unique: true })
export class Grade {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ type: "varchar", length: 1 })
  kind: PartKind;

  @Column({ type: "varchar", length: 40 })
  code: string;

  @Column({ type: "varchar", length: 120 })
  label: string;

  @Column({ type: "double", nullable: true, default: null })
  tolerance: number | null;

  @Column({ name: "tolerance_abs", type: "double", nullable: true, default: null })
  toleranceAbs: number | null;

  @Column({ type: "varchar", length: 10, default: "normal" })
  distribution: Distribution;

  @Column({ name: "cost_each", type: "double" })
  costEach: number;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
