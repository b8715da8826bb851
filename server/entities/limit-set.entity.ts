import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn, type Relation } from "typeorm";
import type { Limits } from "../../shared/engine/limits";
import { Design } from "./design.entity";

/** A planner's acceptance limits for a design, with the lot size used for cost figures. Runs keep their own copy. */
@Entity({ name: "limit_set" })
@Index("IDX_LIMIT_SET_DESIGN", ["designId"])
export class LimitSet {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "design_id", type: "char", length: 36 })
  designId: string;

  @Column({ type: "varchar", length: 120 })
  name: string;

  @Column({ type: "json" })
  limits: Limits;

  @Column({ name: "lot_size", type: "int", default: 1000 })
  lotSize: number;

  @Column({ name: "created_by_id", type: "varchar", length: 255 })
  createdById: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @UpdateDateColumn({ name: "updated_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)", onUpdate: "CURRENT_TIMESTAMP(3)" })
  updatedAt: Date;

  // relations
  @ManyToOne(() => Design, { onDelete: "CASCADE" })
  @JoinColumn({ name: "design_id", foreignKeyConstraintName: "FK_LIMIT_SET_DESIGN" })
  design: Relation<Design>;
}
