import { useEffect, useRef, useState } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { getRunQueryOptions, liveProgressStreams } from "@/features/runs/api/get-run";
import { isFinishedRunState as isFinished, type RunProgress, type RunSummary } from "@shared/contracts";

/**
 * Live progress of a run: server-sent events from `/api/runs/:id/events` while it is queued or running; the run
 * query is not polled while the stream is open. If the stream fails, the query's 1.5 s polling resumes and the rate
 * comes from successive polls:
 * rate = Δtrials / Δt (trials/s), time left = (total − done) / rate (s).
 */
export function useRunProgress(run: RunSummary): RunProgress & { live: boolean } {
  const queryClient = useQueryClient();
  const [event, setEvent] = useState<RunProgress | null>(null);
  const [live, setLive] = useState(false);
  const last = useRef<{ at: number; done: number } | null>(null);
  const [polledRate, setPolledRate] = useState<number | null>(null);
  const finished = isFinished(run.state);

  useEffect(() => {
    if (finished || typeof EventSource === "undefined") return;
    const source = new EventSource(`/api/runs/${encodeURIComponent(run.id)}/events`, { withCredentials: true });
    const refresh = () => void queryClient.invalidateQueries({ queryKey: getRunQueryOptions(run.id).queryKey });
    const stopped = () => {
      source.close();
      setLive(false);
      liveProgressStreams.delete(run.id);
    };
    source.addEventListener("open", () => {
      setLive(true);
      liveProgressStreams.add(run.id);
    });
    source.addEventListener("progress", (e) => {
      try {
        setEvent(JSON.parse((e as MessageEvent<string>).data) as RunProgress);
      } catch {
        /* a malformed event is skipped; the next one or the end refreshes */
      }
    });
    source.addEventListener("end", () => {
      stopped();
      refresh();
    });
    source.addEventListener("error", () => {
      stopped();
      refresh(); // polling takes over from here
    });
    return () => stopped();
  }, [run.id, finished, queryClient]);

  useEffect(() => {
    const now = performance.now();
    const prev = last.current;
    if (prev && run.trialsDone > prev.done && now > prev.at) setPolledRate(((run.trialsDone - prev.done) * 1000) / (now - prev.at));
    last.current = { at: now, done: run.trialsDone };
  }, [run.trialsDone]);

  // The stored row wins once it is newer (further along) than the last event.
  if (event && !finished && event.trialsDone >= run.trialsDone) return { ...event, live };
  const rate = polledRate;
  const eta = rate && rate > 0 ? (run.trialsTotal - run.trialsDone) / rate : null;
  return { state: run.state, trialsDone: run.trialsDone, trialsTotal: run.trialsTotal, ratePerSecond: rate, etaSeconds: finished ? 0 : eta, live };
}
