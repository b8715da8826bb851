import { Column, Entity, Index, PrimaryColumn } from "typeorm";

/** A message received by the local SMTP stand-in (development and demo only). */
@Entity({ name: "outbox_message" })
@Index("IDX_OUTBOX_RECEIVED", ["receivedAt"])
export class OutboxMessage {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "from_address", type: "varchar", length: 320 })
  from: string;

  @Column({ name: "to_addresses", type: "json" })
  to: string[];

  @Column({ type: "varchar", length: 500 })
  subject: string;

  @Column({ name: "text_body", type: "mediumtext" })
  text: string;

  @Column({ name: "received_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  receivedAt: Date;
}
