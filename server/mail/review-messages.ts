import type { OutgoingMail } from "./mailer";

const SIGNATURE = "\n\n— Lotwise, yield estimates for LC filters\nLotwise estimates; it does not certify.";

interface RevisionNames {
  designName: string;
  revisionNumber: number;
  /** link to the design workspace at this revision */
  link: string;
}

const quoted = (comment: string) => (comment ? `\n\nTheir note:\n> ${comment.split("\n").join("\n> ")}` : "");

/** To each active reviewer when a designer asks for a review. */
export function reviewRequestedMail(options: RevisionNames & { to: string; requestedBy: string; comment: string }): OutgoingMail {
  return {
    to: options.to,
    subject: `Review requested: ${options.designName} r${options.revisionNumber}`,
    text:
      `${options.requestedBy} asks for a review of ${options.designName}, revision ${options.revisionNumber}.` +
      quoted(options.comment) +
      `\n\nOpen it, read its runs, then approve or request changes:\n${options.link}` +
      SIGNATURE,
  };
}

/** To the revision's creator and whoever asked for the review when a reviewer decides. */
export function reviewDecidedMail(options: RevisionNames & { to: string; reviewer: string; decision: "approved" | "changes-requested"; comment: string }): OutgoingMail {
  const verdict = options.decision === "approved" ? "approved" : "requested changes to";
  return {
    to: options.to,
    subject: `${options.decision === "approved" ? "Approved" : "Changes requested"}: ${options.designName} r${options.revisionNumber}`,
    text: `${options.reviewer} ${verdict} ${options.designName}, revision ${options.revisionNumber}.` + quoted(options.comment) + `\n\n${options.link}` + SIGNATURE,
  };
}
