/**
 * The writes that end a run, for the run queue (run-queue.ts): the result and final state in one transaction, the
 * re-queue of interrupted runs, and every outcome write retried with backoff while the database is down (until the
 * queue closes: the run then stays `running` and the next start re-queues it). Also the launcher's mail.
 */
import type { DataSource } from "typeorm";
import type { ServerConfig } from "../config/env";
import { isDatabaseDown } from "../db/errors";
import { Design, DesignRevision, Run, RunResultRow, User } from "../entities";
import type { Logger } from "../logger";
import type { Mailer } from "../mail/mailer";
import { runOutcomeMail } from "../mail/run-messages";
import type { RunResult } from "../../shared/engine/result";
import { toStoredResult } from "./stored-result";

export interface RunOutcomeDeps {
  dataSource: DataSource;
  mailer: Mailer;
  log: Logger;
  config: Pick<ServerConfig, "publicOrigin">;
  /** first retry delay (ms), doubling to 5 s */
  firstRetryMs: number;
  /** true once the queue is closing: writes then give up instead of waiting */
  isClosed(): boolean;
  /** a sleep the queue can cut short when it closes */
  sleep(ms: number): Promise<void>;
}

export type RunOutcomes = ReturnType<typeof createRunOutcomes>;

export function createRunOutcomes(deps: RunOutcomeDeps) {
  const { dataSource, log } = deps;

  /**
   * Runs a write of a run's outcome; while the database is down it is retried with backoff (until the queue is
   * closed: the run then stays `running` and the next start re-queues it). Returns undefined when it gave up.
   */
  async function persist<T>(runId: string, what: string, write: () => Promise<T>): Promise<T | undefined> {
    let delay = deps.firstRetryMs;
    for (let attempt = 1; ; attempt++) {
      try {
        return await write();
      } catch (err) {
        const down = isDatabaseDown(err);
        if (!down || deps.isClosed()) {
          log.error("run_write_failed", { runId, what, attempt, databaseDown: down, message: (err as Error).message });
          return undefined;
        }
        if (attempt === 1) log.warn("run_write_waiting_for_database", { runId, what, message: (err as Error).message });
        await deps.sleep(delay);
        delay = Math.min(delay * 2, 5000);
      }
    }
  }

  /**
   * Puts `running` runs (one, or all that a stopped or killed server left) back to `queued`, counting the interruption
   * so the run shows that it was interrupted and resumed; it runs again from its seed to the same result.
   */
  async function requeueInterrupted(runId?: string): Promise<void> {
    const q = dataSource.getRepository(Run).createQueryBuilder().update(Run)
      .set({ state: "queued", startedAt: null, trialsDone: 0, interruptions: () => "interruptions + 1", lastInterruptedAt: new Date() })
      .where("state = :s", { s: "running" });
    if (runId) q.andWhere("id = :id", { id: runId });
    const res = await q.execute();
    if (res.affected) log.warn("runs_interrupted_requeued", { runs: res.affected, ...(runId ? { runId } : {}) });
  }

  /** Run row and run_result in one transaction; false when the run is no longer `running`. */
  async function saveResult(run: Run, result: RunResult): Promise<boolean> {
    return dataSource.transaction(async (m) => {
      const res = await m.getRepository(Run).update(
        { id: run.id, state: "running" },
        {
          state: "done", trialsDone: result.trials, passed: result.passed, yieldFraction: result.yield,
          wilsonLow: result.wilson95[0], wilsonHigh: result.wilson95[1], finishedAt: new Date(), errorCode: null, errorMessage: null,
        },
      );
      if (res.affected !== 1) return false;
      await m.getRepository(RunResultRow).delete({ runId: run.id });
      await m.getRepository(RunResultRow).save(m.getRepository(RunResultRow).create({ runId: run.id, result: toStoredResult(result) }));
      return true;
    });
  }

  /** Mails the launcher that the run finished or failed; a mail that cannot be sent is logged, the outcome stands. */
  async function notifyLauncher(run: Run, outcome: "done" | "failed", result?: RunResult, reason?: string): Promise<void> {
    try {
      const [user, design, revision] = await Promise.all([
        dataSource.getRepository(User).findOneBy({ id: run.launchedById }),
        dataSource.getRepository(Design).findOneBy({ id: run.designId }),
        dataSource.getRepository(DesignRevision).findOneBy({ id: run.revisionId }),
      ]);
      if (!user) return;
      const what = `${design?.name ?? "design"} r${revision?.number ?? "?"}${run.label ? ` (${run.label})` : ""}`;
      const link = `${deps.config.publicOrigin}/runs/${run.id}`;
      await deps.mailer.send(outcome === "done" ? runOutcomeMail({ to: user.email, what, link, outcome, result: result! }) : runOutcomeMail({ to: user.email, what, link, outcome, reason: reason ?? "" }));
    } catch (err) {
      log.error("mail_failed", { kind: `run_${outcome}`, runId: run.id, message: (err as Error).message });
    }
  }

  return { persist, saveResult, requeueInterrupted, notifyLauncher };
}
