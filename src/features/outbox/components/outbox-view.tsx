import { useSearchParams } from "react-router-dom";
import { useOutbox } from "@/features/outbox/api/get-outbox";
import { MessageList } from "@/features/outbox/components/message-list";
import { MessageReader } from "@/features/outbox/components/message-reader";

/** List and reader side by side; the open message is kept in the address (`?message=`). */
export function OutboxView() {
  const { data: messages } = useOutbox();
  const [params, setParams] = useSearchParams();
  const selectedId = params.get("message");
  const selected = messages.find((message) => String(message.id) === selectedId);

  return (
    <div className="grid gap-4 lg:grid-cols-[minmax(16rem,22rem)_1fr]">
      <MessageList
        messages={messages}
        selectedId={selected ? String(selected.id) : null}
        onSelect={(id) => setParams({ message: id })}
      />
      <MessageReader message={selected} />
    </div>
  );
}
