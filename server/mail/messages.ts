import type { Role } from "../../shared/roles";
import type { OutgoingMail } from "./mailer";

const SIGNATURE = "\n\n— Lotwise, yield estimates for LC filters\nLotwise estimates; it does not certify.";

export function invitationMail(options: { to: string; invitedBy: string; roles: Role[]; link: string; expiresAt: Date }): OutgoingMail {
  return {
    to: options.to,
    subject: "You are invited to Lotwise",
    text:
      `${options.invitedBy} invited you to Lotwise as ${options.roles.join(", ")}.\n\n` +
      `Set your name and password here (the link works once, until ${options.expiresAt.toISOString()}):\n${options.link}` +
      SIGNATURE,
  };
}

export function passwordResetMail(options: { to: string; link: string; expiresAt: Date }): OutgoingMail {
  return {
    to: options.to,
    subject: "Reset your Lotwise password",
    text:
      `Someone asked to reset the password of this Lotwise account. If it was you, choose a new one here ` +
      `(the link works once, until ${options.expiresAt.toISOString()}):\n${options.link}\n\nIf it was not you, ignore this mail.` +
      SIGNATURE,
  };
}
