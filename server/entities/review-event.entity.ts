import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import { DesignRevision, type ReviewState } from "./design-revision.entity";
import { User } from "./user.entity";

/** One step of a revision's sign-off (submitted, signed off, returned for rework), with the person's note. */
@Entity({ name: "review_event" })
@Index("IDX_REVIEW_EVENT_REVISION", ["revisionId", "createdAt"])
export class ReviewEvent {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "revision_id", type: "char", length: 36 })
  revisionId: string;

  @Column({ name: "actor_id", type: "varchar", length: 255 })
  actorId: string;

  @Column({ name: "from_state", type: "varchar", length: 20 })
  fromState: ReviewState;

  @Column({ name: "to_state", type: "varchar", length: 20 })
  toState: ReviewState;

  @Column({ type: "varchar", length: 2000, default: "" })
  comment: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  // relations
  @ManyToOne(() => DesignRevision, { onDelete: "CASCADE" })
  @JoinColumn({ name: "revision_id", foreignKeyConstraintName: "FK_REVIEW_EVENT_REVISION" })
  revision: Relation<DesignRevision>;

  @ManyToOne(() => User, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "actor_id", foreignKeyConstraintName: "FK_REVIEW_EVENT_ACTOR" })
  actor: Relation<User>;
}
