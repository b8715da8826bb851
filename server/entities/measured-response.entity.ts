import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import { Design } from "./design.entity";

/** A measured two-port response uploaded as Touchstone, overlaid on the design's plots. Stored parsed, as |S| dB per port pair. */
@Entity({ name: "measured_response" })
@Index("IDX_MEASURED_DESIGN", ["designId"])
export class MeasuredResponse {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "design_id", type: "char", length: 36 })
  designId: string;

  @Column({ type: "varchar", length: 120 })
  name: string;

  @Column({ name: "file_name", type: "varchar", length: 255 })
  fileName: string;

  /** { freqs: number[], ports: number, z0: number[], s: number[] (interleaved complex, engine layout) } */
  @Column({ type: "json" })
  data: { freqs: number[]; ports: number; z0: number[]; s: number[] };

  @Column({ name: "uploaded_by_id", type: "varchar", length: 255 })
  uploadedById: string;

  @CreateDateColumn({ name: "created_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  createdAt: Date;

  // relations
  @ManyToOne(() => Design, { onDelete: "CASCADE" })
  @JoinColumn({ name: "design_id", foreignKeyConstraintName: "FK_MEASURED_DESIGN" })
  design: Relation<Design>;
}
