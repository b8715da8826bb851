import nodemailer from "nodemailer";
import type { ServerConfig } from "../config/env";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
}

export interface Mailer {
  send(mail: OutgoingMail): Promise<void>;
  /** "smtp" for a configured host, "stand-in" for the local sink. */
  readonly mode: "smtp" | "stand-in";
  close(): void;
}

/**
 * Mail through nodemailer. With LOTWISE_SMTP_HOST set it uses that server (TLS on 465, STARTTLS required on
 * others); otherwise the local stand-in on loopback, plain SMTP (smtp-server's built-in STARTTLS certificate has expired, so STARTTLS is off on the stand-in).
 */
export function createMailer(config: Pick<ServerConfig, "smtp" | "mailFrom">): Mailer {
  const { smtp } = config;
  const real = Boolean(smtp.host);
  const transport = real
    ? nodemailer.createTransport({
        host: smtp.host,
        port: smtp.port ?? (smtp.secure ? 465 : 587),
        secure: smtp.secure,
        requireTLS: !smtp.secure,
        auth: smtp.user ? { user: smtp.user, pass: smtp.password ?? "" } : undefined,
      })
    : nodemailer.createTransport({ host: "127.0.0.1", port: smtp.sinkPort, secure: false, ignoreTLS: true });

  return {
    mode: real ? "smtp" : "stand-in",
    async send(mail) {
      await transport.sendMail({ from: config.mailFrom, to: mail.to, subject: mail.subject, text: mail.text });
    },
    close: () => transport.close(),
  };
}
