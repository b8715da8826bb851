import type { Response } from "express";
import type { AppContext } from "../context";
import { Run, RunResultRow } from "../entities";
import { AppError } from "../errors";
import { presentRunSummary } from "../presenters/run.presenter";
import { checkTrialIndex, presentTrialReplay, runTouchstone, streamTrialsCsv, trialCountOf } from "../services/run-exports";
import type { RunEvent } from "../services/run-queue";
import { createRun, findRun, runDetail } from "../services/runs";
import { createRunSchema } from "../../shared/schemas/run-request";
import { ApiRouter } from "./api-router";

const LAUNCHERS = ["designer", "planner", "analyst"] as const;
const FINISHED = new Set(["done", "failed", "cancelled"]);
/** SSE progress cadence (ms). */
const SSE_INTERVAL_MS = 500;

async function storedResult(ctx: AppContext, run: Run): Promise<Record<string, unknown> | null> {
  if (run.state !== "done") return null;
  return (await ctx.dataSource.getRepository(RunResultRow).findOneBy({ runId: run.id }))?.result ?? null;
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
    access: LAUNCHERS,
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

  // Server-sent events: `progress` about every 0.5 s while queued or running, then `end` and close.
  api.get("/runs/:id/events", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const runId = String(req.params.id);
      await findRun(ctx, runId);
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
      const fromDb = async () => {
        const run = await ctx.dataSource.getRepository(Run).findOneBy({ id: runId });
        if (!run || FINISHED.has(run.state)) return finish(run?.state ?? "cancelled");
        const live = ctx.runQueue.live(runId);
        if (live) return send("progress", { state: live.state, trialsDone: live.trialsDone, trialsTotal: live.trialsTotal, ratePerSecond: live.ratePerSecond, etaSeconds: live.etaSeconds });
        send("progress", { state: run.state, trialsDone: run.trialsDone, trialsTotal: run.trialsTotal, ratePerSecond: null, etaSeconds: null });
      };
      const onEvent = (e: RunEvent) => {
        if (e.type === "end") finish(e.state);
      };
      const unsubscribe = ctx.runQueue.subscribe(runId, onEvent);
      // A failed read (the database briefly away) skips a tick: the run survives an outage, so the stream must not
      // report it as failed; the next tick reads again.
      const timer = setInterval(() => void fromDb().catch(() => undefined), SSE_INTERVAL_MS);
      const cleanup = () => {
        clearInterval(timer);
        unsubscribe();
      };
      req.once("close", () => {
        ended = true;
        cleanup();
      });
      await fromDb();
    },
  });

  api.post("/runs/:id/cancel", {
    access: LAUNCHERS,
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      if (!(await ctx.runQueue.cancel(run.id))) throw new AppError("RUN_FINISHED", `This run has already ended (${run.state === "running" || run.state === "queued" ? "just now" : run.state}).`);
      res.json({ run: presentRunSummary(await findRun(ctx, run.id)) });
    },
  });

  api.get("/runs/:id/trials.csv", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      await streamTrialsCsv(res, run, trialCountOf(run, await storedResult(ctx, run)));
    },
  });

  api.get("/runs/:id/nominal.s2p", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      sendS2p(res, `lotwise-run-${run.id.slice(0, 8)}-nominal.s2p`, runTouchstone(run, null));
    },
  });

  // Registered before /trials/:index so "7.s2p" is not taken for an index.
  api.get("/runs/:id/trials/:index.s2p", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const index = checkTrialIndex(String(req.params.index), trialCountOf(run, await storedResult(ctx, run)));
      sendS2p(res, `lotwise-run-${run.id.slice(0, 8)}-trial-${index}.s2p`, runTouchstone(run, index));
    },
  });

  api.get("/runs/:id/trials/:index", {
    access: "signed-in",
    handler: async ({ req, res }) => {
      const run = await findRun(ctx, String(req.params.id));
      const index = checkTrialIndex(String(req.params.index), trialCountOf(run, await storedResult(ctx, run)));
      res.json(presentTrialReplay(run, index));
    },
  });

  return api;
}
