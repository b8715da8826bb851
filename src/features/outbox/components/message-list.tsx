import { cn } from "@/utils/cn";
import { formatDateTime } from "@/utils/format";
import type { OutboxMessage } from "@/features/outbox/api/get-outbox";

type Props = {
  messages: OutboxMessage[];
  selectedId: string | null;
  onSelect: (id: string) => void;
};

/** The stored mail as a column of entries; pressing one opens it. */
export function MessageList({ messages, selectedId, onSelect }: Props) {
  if (messages.length === 0) {
    return <p className="text-sm text-ink-300">No mail yet. Invitations and reset links land here.</p>;
  }
  return (
    <ul aria-label="Stored messages" className="flex flex-col divide-y divide-ink-700 rounded-md border border-ink-700">
      {messages.map((message) => {
        const selected = String(message.id) === selectedId;
        return (
          <li key={message.id}>
            <button
              type="button"
              aria-current={selected || undefined}
              onClick={() => onSelect(String(message.id))}
              className={cn(
                "flex w-full flex-col gap-0.5 border-l-2 px-3 py-2.5 text-left transition-colors",
                "focus-visible:outline-2 focus-visible:-outline-offset-2 focus-visible:outline-signal-300",
                selected ? "border-signal-400 bg-ink-800" : "border-transparent hover:bg-ink-800/60",
              )}
            >
              <span className="truncate text-sm font-semibold text-paper-50">{message.subject || "(no subject)"}</span>
              <span className="truncate font-mono text-xs text-ink-300">to {message.to.join(", ")}</span>
              <span className="font-mono text-[11px] text-ink-400">{formatDateTime(message.receivedAt)}</span>
            </button>
          </li>
        );
      })}
    </ul>
  );
}
