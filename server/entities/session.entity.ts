import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import { User } from "./user.entity";

/** A sign-in session (`auth_session`), written and read by lucia through its MySQL adapter. */
@Entity({ name: "auth_session" })
@Index("IDX_AUTH_SESSION_USER", ["userId"])
export class Session {
  @PrimaryColumn({ type: "varchar", length: 255 })
  id: string;

  @Column({ name: "user_id", type: "varchar", length: 255 })
  userId: string;

  @Column({ name: "expires_at", type: "datetime" })
  expiresAt: Date;

  // relations
  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "user_id", foreignKeyConstraintName: "FK_AUTH_SESSION_USER" })
  user: Relation<User>;
}
