import { Column, Entity, JoinColumn, OneToOne, PrimaryColumn, type Relation } from "typeorm";
import { Run } from "./run.entity";

/** A finished run's whole engine result (histograms, envelopes, sensitivity, Cpk...), written with the run in one transaction. */
@Entity({ name: "run_result" })
export class RunResultRow {
  @PrimaryColumn({ name: "run_id", type: "char", length: 36 })
  runId: string;

  @Column({ type: "json" })
  result: Record<string, unknown>;

  // relations
  @OneToOne(() => Run, { onDelete: "CASCADE" })
  @JoinColumn({ name: "run_id", foreignKeyConstraintName: "FK_RUN_RESULT_RUN" })
  run: Relation<Run>;
}
