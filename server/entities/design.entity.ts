import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, UpdateDateColumn, type Relation } from "typeorm";
import { User } from "./user.entity";
import type { StressClass } from "../../shared/contracts/vocabulary";

/** How the filter is used, for the safety cautions Lotwise shows beside it. */
export { STRESS_CLASSES, type StressClass } from "../../shared/contracts/vocabulary";

/** A filter the team is developing; its netlists live in immutable-once-used revisions. */
@Entity({ name: "design" })
@Index("IDX_DESIGN_OWNER", ["ownerId"])
export class Design {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ type: "varchar", length: 120 })
  name: string;

  @Column({ type: "varchar", length: 2000, default: "" })
  description: string;

  @Column({ type: "varchar", length: 20, default: "small-signal" })
  stress: StressClass;

  @Column({ name: "owner_id", type: "varchar", length: 255 })
  ownerId: string;

  @Column({ name: "archived_at", type: "datetime", precision: 3, nullable: true, default: null })
  archivedAt: Date | null;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @UpdateDateColumn({ name: "updated_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)", onUpdate: "CURRENT_TIMESTAMP(3)" })
  updatedAt: Date;

  // relations
  @ManyToOne(() => User, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "owner_id", foreignKeyConstraintName: "FK_DESIGN_OWNER" })
  owner: Relation<User>;
}
