import type { OutgoingMail } from "./mailer";

const SIGNATURE = "\n\n— Lotwise, yield estimates for LC filters\nLotwise estimates; it does not certify.";

interface RevisionNames {
  designName: string;
  revisionNumber: number;
  /** link to the design workspace at this revision */
  link: string;
}

const quoted = (comment: string) => (comment ? `\n\nTheir note:\n> ${comment.split("\n").join("\n> ")}` : "");

/** To each active reviewer when a designer submits a revision for sign-off. */
export function reviewRequestedMail(options: RevisionNames & { to: string; requestedBy: string; comment: string }): OutgoingMail {
  return {
    to: options.to,
    subject: `Sign-off requested: ${options.designName} r${options.revisionNumber}`,
    text:
      `${options.requestedBy} submits ${options.designName}, revision ${options.revisionNumber}, for sign-off.` +
      quoted(options.comment) +
      `\n\nOpen it, read its runs, then sign it off or return it for rework:\n${options.link}` +
      SIGNATURE,
  };
}

/** To the revision's creator and whoever asked for the review when a reviewer decides. */
export function reviewDecidedMail(options: RevisionNames & { to: string; reviewer: string; decision: "signed-off" | "returned"; comment: string }): OutgoingMail {
  const verdict = options.decision === "signed-off" ? "signed off" : "returned for rework";
  return {
    to: options.to,
    subject: `${options.decision === "signed-off" ? "Signed off" : "Returned for rework"}: ${options.designName} r${options.revisionNumber}`,
    text: `${options.reviewer} ${verdict} ${options.designName}, revision ${options.revisionNumber}.` + quoted(options.comment) + `\n\n${options.link}` + SIGNATURE,
  };
}
