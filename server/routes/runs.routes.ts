import type { Response } from "express";
import type { AppContext } from "../context";
import { AppError } from "../errors";
import { presentRunSummary } from "../presenters/run.presenter";
import {
  checkTrialIndex, exportSignal, planTrialsCsv, requireDone, runTouchstone, trialCountOf, trialReplay, trialsCsvHeader, trialsCsvRows,
} from "../services/run-exports";
import type { RunEvent } from "../services/run-queue";
import { createRun, findRun, runDetail, runProgressRow } from "../services/runs";
import { createRunSchema } from "../../shared/schemas/run-request";
import { ApiRouter } from "./api-router";
import { ACCESS } from "../../shared/contracts/access";
import { isFinishedRunState } from "../../shared/contracts/vocabulary";

/** SSE tick (ms): session check and a narrow read of the run row (progress itself comes from the queue's events). */
const SSE_TICK_MS = 2000;

/** Waits until the socket takes more (`drain`) or the export stops, with no listener left behind either way. */
function drained(res: Response, signal: AbortSignal): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const done = () => {
      res.off("drain", done);
      signal.removeEventListener("abort", stop);
      resolve();
    };
    const stop = () => {
      res.off("drain", done);
      reject(signal.reason);
    };
    if (signal.aborted) return stop();
    res.on("drain", done);
    signal.addEventListener("abort", stop, { once: true });
  });
}

function sendS2p(res: Response, name: string, text: string): void {
  res.set("Content-Type", "application/octet-stream");
  res.set("Content-Disposition", `attachment; filename="${name}"`);
  res.send(text);
}

/** Launch, progress (SSE), cancel, trial replay and exports of runs. Lists, compare and sweeps live in reviews.routes.ts. */
export function runsRoutes(ctx: AppContext): ApiRouter {
  const api = new ApiRouter();

  api.post("/runs", {
    access: ACCESS.launchRuns,
    body: createRunSchema,
    handler: async ({ res, body, user }) => {
      const run = await createRun(ctx, user!, body);
      res.status(201).json({ run: presentRunSummary(await findRun(ctx, run.id)) });
    },
  });

  api.get("/runs/:id", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      res.json(await runDetail(ctx, String(req.params.id)));
    },
  });

  // Server-sent events: `progress` as the queue reports it (at most about twice a second) and on a 2 s tick while
  // queued or running, then `end` and close. The tick also checks that the session still holds: a person signed out,
  // deactivated or changed in role stops hearing at once (`end` with state "signed-out").
  api.get("/runs/:id/events", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const runId = String(req.params.id);
      await findRun(ctx, runId);
      const sessionToken = (res.locals.sessionToken as string | null | undefined) ?? null;
      res.status(200);
      res.set({ "Content-Type": "text/event-stream", "Cache-Control": "no-store", Connection: "keep-alive", "X-Accel-Buffering": "no" });
      res.flushHeaders();
      let ended = false;
      const send = (event: string, data: unknown) => {
        if (!ended) res.write(`event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
      };
      const finish = (state: string) => {
        if (ended) return;
        send("end", { state });
        ended = true;
        cleanup();
        res.end();
      };
      const progressOf = (e: Extract<RunEvent, { type: "progress" }>) => ({ state: e.state, trialsDone: e.trialsDone, trialsTotal: e.trialsTotal, ratePerSecond: e.ratePerSecond, etaSeconds: e.etaSeconds });
      const tick = async () => {
        const check = await ctx.sessions.validate(sessionToken);
        if (!check.user) return finish("signed-out");
        const run = await runProgressRow(ctx, runId);
        if (!run || isFinishedRunState(run.state)) return finish(run?.state ?? "cancelled");
        const live = ctx.runQueue.live(runId);
        if (live) return send("progress", progressOf(live));
        send("progress", { state: run.state, trialsDone: run.trialsDone, trialsTotal: run.trialsTotal, ratePerSecond: null, etaSeconds: null });
      };
      const onEvent = (e: RunEvent) => {
        if (e.type === "end") finish(e.state);
        else send("progress", progressOf(e));
      };
      const unsubscribe = ctx.runQueue.subscribe(runId, onEvent);
      // A failed read (the database briefly away) skips a tick: the run survives an outage, so the stream must not
      // report it as failed; the next tick reads again.
      const timer = setInterval(() => void tick().catch(() => undefined), SSE_TICK_MS);
      const cleanup = () => {
        clearInterval(timer);
        unsubscribe();
      };
      req.once("close", () => {
        ended = true;
        cleanup();
      });
      await tick();
    },
  });

  api.post("/runs/:id/cancel", {
    access: ACCESS.launchRuns,
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      if (!(await ctx.runQueue.cancel(run.id))) throw new AppError("RUN_FINISHED", `This run has already ended (${run.state === "running" || run.state === "queued" ? "just now" : run.state}).`);
      res.json({ run: presentRunSummary(await findRun(ctx, run.id)) });
    },
  });

  // Exports: computed on the export thread under one signal per request (client gone or time budget spent).
  api.get("/runs/:id/trials.csv", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const csv = await planTrialsCsv(ctx, run, trialCountOf(run));
      requireDone(run);
      const exp = await exportSignal(ctx, (abort) => res.once("close", abort));
      try {
        res.status(200);
        res.set("Content-Type", "text/csv; charset=utf-8");
        res.set("Content-Disposition", `attachment; filename="lotwise-run-${run.id.slice(0, 8)}-trials.csv"`);
        res.write(trialsCsvHeader(run));
        for await (const text of trialsCsvRows(ctx, run, csv, exp.signal)) {
          if (!res.write(text)) await drained(res, exp.signal);
        }
        res.end();
      } catch (err) {
        if (!exp.signal.aborted) throw err;
        // Past its budget (or the client left): the download ends short; a partial file must not look complete.
        if (exp.signal.reason instanceof AppError) ctx.log.warn("export_stopped", { runId: run.id, reason: exp.signal.reason.code, seconds: exp.seconds });
        else ctx.log.info("export_stopped", { runId: run.id, reason: "client_gone" });
        res.destroy();
      } finally {
        exp.dispose();
      }
    },
  });

  api.get("/runs/:id/nominal.s2p", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const text = await withExportSignal(res, (signal) => runTouchstone(ctx, run, null, signal));
      sendS2p(res, `lotwise-run-${run.id.slice(0, 8)}-nominal.s2p`, text);
    },
  });

  // Registered before /trials/:index so "7.s2p" is not taken for an index.
  api.get("/runs/:id/trials/:index.s2p", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const index = checkTrialIndex(String(req.params.index), trialCountOf(run));
      requireDone(run);
      const text = await withExportSignal(res, (signal) => runTouchstone(ctx, run, index, signal));
      sendS2p(res, `lotwise-run-${run.id.slice(0, 8)}-trial-${index}.s2p`, text);
    },
  });

  api.get("/runs/:id/trials/:index", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const index = checkTrialIndex(String(req.params.index), trialCountOf(run));
      requireDone(run);
      res.json(await withExportSignal(res, (signal) => trialReplay(ctx, run, index, signal)));
    },
  });

  /** Runs one export task under a signal; a spent budget answers 503 EXPORT_TIMEOUT (the client leaving needs no answer). */
  async function withExportSignal<T>(res: Response, work: (signal: AbortSignal) => Promise<T>): Promise<T> {
    const exp = await exportSignal(ctx, (abort) => res.once("close", abort));
    try {
      return await work(exp.signal);
    } catch (err) {
      if (exp.signal.aborted && exp.signal.reason instanceof AppError) throw exp.signal.reason;
      throw err;
    } finally {
      exp.dispose();
    }
  }

  return api;
}
