import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import { User } from "./user.entity";

/** A single-use, expiring password-reset token (stored as its SHA-256). */
@Entity({ name: "password_reset" })
@Index("IDX_PASSWORD_RESET_TOKEN", ["tokenHash"], { unique: true })
export class PasswordReset {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "user_id", type: "varchar", length: 255 })
  userId: string;

  @Column({ name: "token_hash", type: "char", length: 64 })
  tokenHash: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @Column({ name: "expires_at", type: "datetime", precision: 3 })
  expiresAt: Date;

  @Column({ name: "used_at", type: "datetime", precision: 3, nullable: true, default: null })
  usedAt: Date | null;

  // relations
  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "user_id", foreignKeyConstraintName: "FK_PASSWORD_RESET_USER" })
  user: Relation<User>;
}
