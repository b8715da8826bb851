import type { RunResult } from "../../shared/engine/result";
import type { OutgoingMail } from "./mailer";

const pct = (x: number) => (100 * x).toFixed(1);

/** The mail a run's launcher gets when it finishes (with its yield and interval) or fails (with the reason). */
export function runOutcomeMail(o: { to: string; what: string; link: string } & ({ outcome: "done"; result: RunResult } | { outcome: "failed"; reason: string })): OutgoingMail {
  const subject = o.outcome === "done" ? `Run finished: ${o.what} — yield ${pct(o.result.yield)} %` : `Run failed: ${o.what}`;
  const body = o.outcome === "done"
    ? `Your run of ${o.what} finished: ${o.result.passed} of ${o.result.trials} trials passed, yield ${pct(o.result.yield)} % ` +
      `(95 % interval ${pct(o.result.wilson95[0])} – ${pct(o.result.wilson95[1])} %).`
    : `Your run of ${o.what} failed: ${o.reason}`;
  return { to: o.to, subject, text: `${body}\n\nOpen it: ${o.link}\n\n— Lotwise\nLotwise estimates; it does not certify.` };
}
