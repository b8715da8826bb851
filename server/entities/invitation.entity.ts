import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import type { Role } from "../../shared/roles";
import { User } from "./user.entity";

/** An admin's invitation of an e-mail address with roles; the token itself is only ever mailed, we keep its SHA-256. */
@Entity({ name: "invitation" })
@Index("IDX_INVITATION_TOKEN", ["tokenHash"], { unique: true })
@Index("IDX_INVITATION_EMAIL", ["email"])
export class Invitation {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ type: "varchar", length: 254 })
  email: string;

  @Column({ type: "json" })
  roles: Role[];

  @Column({ name: "token_hash", type: "char", length: 64 })
  tokenHash: string;

  @Column({ name: "invited_by_id", type: "varchar", length: 255 })
  invitedById: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @Column({ name: "expires_at", type: "datetime", precision: 3 })
  expiresAt: Date;

  @Column({ name: "accepted_at", type: "datetime", precision: 3, nullable: true, default: null })
  acceptedAt: Date | null;

  @Column({ name: "revoked_at", type: "datetime", precision: 3, nullable: true, default: null })
  revokedAt: Date | null;

  // relations
  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "invited_by_id", foreignKeyConstraintName: "FK_INVITATION_INVITED_BY" })
  invitedBy: Relation<User>;
}
