import { Column, Entity, PrimaryColumn } from "typeorm";

/** One setting the admin changes at run time (the run and export cost limits); absent keys take their defaults. */
@Entity({ name: "app_setting" })
export class AppSetting {
  @PrimaryColumn({ type: "varchar", length: 64 })
  key: string;

  @Column({ type: "json" })
  value: unknown;

  @Column({ name: "updated_by_id", type: "varchar", length: 255, nullable: true, default: null })
  updatedById: string | null;

  @Column({ name: "updated_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  updatedAt: Date;
}
