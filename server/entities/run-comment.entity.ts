import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import { Run } from "./run.entity";
import { User } from "./user.entity";

@Entity({ name: "run_comment" })
@Index("IDX_RUN_COMMENT_RUN", ["runId", "createdAt"])
export class RunComment {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "run_id", type: "char", length: 36 })
  runId: string;

  @Column({ name: "author_id", type: "varchar", length: 255 })
  authorId: string;

  @Column({ type: "text" })
  body: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  // relations
  @ManyToOne(() => Run, { onDelete: "CASCADE" })
  @JoinColumn({ name: "run_id", foreignKeyConstraintName: "FK_RUN_COMMENT_RUN" })
  run: Relation<Run>;

  @ManyToOne(() => User, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "author_id", foreignKeyConstraintName: "FK_RUN_COMMENT_AUTHOR" })
  author: Relation<User>;
}
