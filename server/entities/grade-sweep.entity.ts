import { Column, CreateDateColumn, Entity, Index, PrimaryColumn } from "typeorm";

/** An analyst's grade sweep: one run per grade assignment of one revision, compared on yield and cost per good unit. */
@Entity({ name: "grade_sweep" })
@Index("IDX_GRADE_SWEEP_DESIGN", ["designId"])
export class GradeSweep {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "design_id", type: "char", length: 36 })
  designId: string;

  @Column({ name: "revision_id", type: "char", length: 36 })
  revisionId: string;

  @Column({ type: "varchar", length: 120 })
  name: string;

  @Column({ name: "target_yield", type: "double" })
  targetYield: number;

  @Column({ name: "created_by_id", type: "varchar", length: 255 })
  createdById: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;
}
