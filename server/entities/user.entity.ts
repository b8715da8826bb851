import { Column, CreateDateColumn, Entity, Index, PrimaryColumn, UpdateDateColumn } from "typeorm";
import type { Role } from "../../shared/roles";

/** A person who can sign in. Lucia reads this table as its user table (`auth_user`). */
@Entity({ name: "auth_user" })
@Index("IDX_AUTH_USER_EMAIL", ["email"], { unique: true })
export class User {
  @PrimaryColumn({ type: "varchar", length: 255 })
  id: string;

  @Column({ type: "varchar", length: 254 })
  email: string;

  @Column({ type: "varchar", length: 120 })
  name: string;

  @Column({ name: "password_hash", type: "varchar", length: 255 })
  passwordHash: string;

  @Column({ type: "json" })
  roles: Role[];

  @Column({ type: "boolean", default: true })
  active: boolean;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  @UpdateDateColumn({ name: "updated_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)", onUpdate: "CURRENT_TIMESTAMP(3)" })
  updatedAt: Date;
}
