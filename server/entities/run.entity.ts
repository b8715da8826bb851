import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from "typeorm";
import type { Limits } from "../../shared/engine/limits";
import type { Netlist } from "../../shared/engine/netlist";
import { DesignRevision } from "./design-revision.entity";
import { Design } from "./design.entity";
import { GradeSweep } from "./grade-sweep.entity";
import { User } from "./user.entity";
import type { RunState } from "../../shared/contracts/vocabulary";

export { RUN_STATES, type RunState } from "../../shared/contracts/vocabulary";

/**
 * A Monte Carlo run: its inputs are copied in (netlist after grade overrides, limits, options with the seed), so a stored
 * run can be re-run or replayed exactly whatever later happens to the design. Results live in `run_result`.
 */
@Entity({ name: "run" })
@Index("IDX_RUN_STATE_QUEUED", ["state", "queuedAt"])
@Index("IDX_RUN_DESIGN", ["designId", "queuedAt"])
@Index("IDX_RUN_SWEEP", ["sweepId"])
export class Run {
  @PrimaryColumn({ type: "char", length: 36 })
  id: string;

  @Column({ name: "design_id", type: "char", length: 36 })
  designId: string;

  @Column({ name: "revision_id", type: "char", length: 36 })
  revisionId: string;

  @Column({ name: "limit_set_id", type: "char", length: 36, nullable: true, default: null })
  limitSetId: string | null;

  @Column({ name: "sweep_id", type: "char", length: 36, nullable: true, default: null })
  sweepId: string | null;

  @Column({ type: "varchar", length: 160, default: "" })
  label: string;

  @Column({ type: "json" })
  netlist: Netlist;

  @Column({ type: "json" })
  limits: Limits;

  /** Engine RunOptions as sent to the pool (trials, seed, sweep, corners, targetHalfWidth...). */
  @Column({ type: "json" })
  options: Record<string, unknown>;

  /** Part ref → grade code applied before the run. */
  @Column({ name: "grade_overrides", type: "json" })
  gradeOverrides: Record<string, string>;

  @Column({ name: "lot_size", type: "int", default: 1000 })
  lotSize: number;

  @Column({ name: "bom_cost", type: "double", nullable: true, default: null })
  bomCost: number | null;

  @Column({ type: "varchar", length: 12, default: "queued" })
  state: RunState;

  @Column({ name: "trials_done", type: "int", default: 0 })
  trialsDone: number;

  @Column({ name: "trials_total", type: "int" })
  trialsTotal: number;

  @Column({ type: "int", nullable: true, default: null })
  passed: number | null;

  @Column({ name: "yield", type: "double", nullable: true, default: null })
  yieldFraction: number | null;

  @Column({ name: "wilson_low", type: "double", nullable: true, default: null })
  wilsonLow: number | null;

  @Column({ name: "wilson_high", type: "double", nullable: true, default: null })
  wilsonHigh: number | null;

  @Column({ name: "error_code", type: "varchar", length: 40, nullable: true, default: null })
  errorCode: string | null;

  @Column({ name: "error_message", type: "varchar", length: 1000, nullable: true, default: null })
  errorMessage: string | null;

  @Column({ name: "launched_by_id", type: "varchar", length: 255 })
  launchedById: string;

  @Column({ name: "queued_at", type: "datetime", precision: 3, default: () => "CURRENT_TIMESTAMP(3)" })
  queuedAt: Date;

  @Column({ name: "started_at", type: "datetime", precision: 3, nullable: true, default: null })
  startedAt: Date | null;

  @Column({ name: "finished_at", type: "datetime", precision: 3, nullable: true, default: null })
  finishedAt: Date | null;

  /** How often the run was interrupted (server stopped or killed while it ran) and queued again to run from its seed. */
  @Column({ type: "int", default: 0 })
  interruptions: number;

  @Column({ name: "last_interrupted_at", type: "datetime", precision: 3, nullable: true, default: null })
  lastInterruptedAt: Date | null;

  // relations
  @ManyToOne(() => Design, { onDelete: "CASCADE" })
  @JoinColumn({ name: "design_id", foreignKeyConstraintName: "FK_RUN_DESIGN" })
  design: Relation<Design>;

  @ManyToOne(() => DesignRevision, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "revision_id", foreignKeyConstraintName: "FK_RUN_REVISION" })
  revision: Relation<DesignRevision>;

  @ManyToOne(() => GradeSweep, { onDelete: "SET NULL" })
  @JoinColumn({ name: "sweep_id", foreignKeyConstraintName: "FK_RUN_SWEEP" })
  sweep: Relation<GradeSweep> | null;

  @ManyToOne(() => User, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "launched_by_id", foreignKeyConstraintName: "FK_RUN_LAUNCHED_BY" })
  launchedBy: Relation<User>;
}
