import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import type { Netlist } from "../../shared/engine/netlist";
import { Design } from "./design.entity";
import { User } from "./user.entity";
import type { SweepSetting } from "../../shared/contracts/designs";
import type { ReviewState } from "../../shared/contracts/vocabulary";

export { REVIEW_STATES, type ReviewState } from "../../shared/contracts/vocabulary";

/** Default sweep of a revision's nominal plot (its shape is the API contract's). */
export type { SweepSetting } from "../../shared/contracts/designs";

/** One netlist of a design. Editable until a run references it (`locked`); after that only "new revision from this one". */
@Entity({ name: "design_revision" })
@Index("IDX_REVISION_DESIGN_NUMBER", ["designId", "number"], { unique: true })
export class DesignRevision {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "design_id", type: "char", length: 36 })
  designId: string;

  @Column({ type: "int" })
  number: number;

  @Column({ type: "json" })
  netlist: Netlist;

  @Column({ type: "json" })
  sweep: SweepSetting;

  @Column({ type: "varchar", length: 500, default: "" })
  note: string;

  @Column({ name: "parent_id", type: "char", length: 36, nullable: true, default: null })
  parentId: string | null;

  @Column({ name: "review_state", type: "varchar", length: 20, default: "draft" })
  reviewState: ReviewState;

  @Column({ type: "boolean", default: false })
  locked: boolean;

  @Column({ name: "created_by_id", type: "varchar", length: 255 })
  createdById: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  // relations
  @ManyToOne(() => Design, { onDelete: "CASCADE" })
  @JoinColumn({ name: "design_id", foreignKeyConstraintName: "FK_REVISION_DESIGN" })
  design: Relation<Design>;

  @ManyToOne(() => User, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "created_by_id", foreignKeyConstraintName: "FK_REVISION_CREATED_BY" })
  createdBy: Relation<User>;
}
