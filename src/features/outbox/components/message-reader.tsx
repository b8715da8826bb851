import { formatDateTime } from "@/utils/format";
import type { OutboxMessage } from "@/features/outbox/api/get-outbox";
import { LinkedText } from "@/features/outbox/components/linked-text";

/** One stored mail: its envelope and its plain text, with links clickable. */
export function MessageReader({ message }: { message: OutboxMessage | undefined }) {
  if (!message) {
    return (
      <div className="flex h-full min-h-40 items-center justify-center rounded-md border border-dashed border-ink-700 text-sm text-ink-400">
        Choose a message to read it.
      </div>
    );
  }
  return (
    <article aria-label={`Message: ${message.subject}`} className="rounded-md border border-ink-700 bg-ink-950/60">
      <header className="border-b border-ink-700 px-4 py-3">
        <h2 className="text-base font-semibold text-paper-50">{message.subject || "(no subject)"}</h2>
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5 text-xs">
          <dt className="text-ink-400">From</dt>
          <dd className="font-mono text-paper-200">{message.from}</dd>
          <dt className="text-ink-400">To</dt>
          <dd className="font-mono text-paper-200">{message.to.join(", ")}</dd>
          <dt className="text-ink-400">Received</dt>
          <dd className="font-mono text-paper-200">{formatDateTime(message.receivedAt)}</dd>
        </dl>
      </header>
      <div className="whitespace-pre-wrap break-words px-4 py-4 font-mono text-sm leading-relaxed text-paper-100">
        <LinkedText text={message.text} />
      </div>
    </article>
  );
}
