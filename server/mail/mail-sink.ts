import { randomUUID } from "node:crypto";
import type { AddressInfo } from "node:net";
import { simpleParser } from "mailparser";
import { SMTPServer } from "smtp-server";
import type { DataSource } from "typeorm";
import { OutboxMessage } from "../entities";

const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

export interface MailSink {
  port: number;
  close(): Promise<void>;
}

/**
 * The local SMTP stand-in: accepts every message on loopback and stores it in `outbox_message`, where the
 * admin-only Outbox screen and the tests read it. Development and demo only; a real SMTP host replaces it.
 */
export async function startMailSink(dataSource: DataSource, options: { port?: number; host?: string } = {}): Promise<MailSink> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    logger: false,
    size: MAX_MESSAGE_BYTES,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const to = session.envelope.rcptTo.map((r) => r.address);
          const from = session.envelope.mailFrom ? session.envelope.mailFrom.address : "";
          await dataSource.getRepository(OutboxMessage).insert({
            id: randomUUID(),
            from: parsed.from?.text ?? from,
            to,
            subject: (parsed.subject ?? "").slice(0, 500),
            text: parsed.text ?? "",
          });
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 0, options.host ?? "127.0.0.1", () => resolve());
  });
  const port = ((server as unknown as { server: { address(): AddressInfo } }).server.address()).port;
  return {
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
