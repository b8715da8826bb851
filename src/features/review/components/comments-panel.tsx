import { useState, type FormEvent } from "react";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { commentSchema, useAddComment, useComments } from "@/features/review/api/comments";
import { formatDateTime } from "@/utils/format";

/** The run's discussion, oldest first, with a box to add to it. */
export function CommentsPanel({ runId }: { runId: string }) {
  const comments = useComments(runId);
  const add = useAddComment(runId);
  const [body, setBody] = useState("");
  const [error, setError] = useState<string>();

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const parsed = commentSchema.safeParse({ body });
    if (!parsed.success) return setError(parsed.error.issues[0]?.message);
    setError(undefined);
    add.mutate(parsed.data.body, { onSuccess: () => setBody("") });
  };

  return (
    <div className="flex flex-col gap-4">
      {comments.data.length === 0 ? (
        <p className="text-sm text-ink-300">No comments yet.</p>
      ) : (
        <ol className="flex flex-col gap-3" aria-label="Comments">
          {comments.data.map((c) => (
            <li key={c.id} className="rounded-md border border-ink-700 bg-ink-950/60 px-4 py-3">
              <p className="text-xs text-ink-300">
                <span className="font-semibold text-paper-200">{c.author.name}</span> · {formatDateTime(c.createdAt)}
              </p>
              <p className="mt-1 whitespace-pre-wrap text-sm text-paper-100">{c.body}</p>
            </li>
          ))}
        </ol>
      )}
      <form onSubmit={submit} className="flex flex-col gap-2" aria-label="Add a comment">
        <label htmlFor="run-comment" className="text-sm font-semibold text-paper-200">
          Comment
        </label>
        <textarea
          id="run-comment"
          rows={3}
          value={body}
          onChange={(e) => setBody(e.target.value)}
          aria-invalid={error ? true : undefined}
          className="rounded-md border border-ink-600 bg-ink-950 px-3 py-2 text-sm text-paper-50 focus-visible:outline-2 focus-visible:outline-signal-400"
        />
        {error && <p className="text-xs font-semibold text-fault-300">{error}</p>}
        {add.isError && <Alert tone="error">{add.error.message}</Alert>}
        <div>
          <Button type="submit" variant="secondary" pending={add.isPending}>
            Post comment
          </Button>
        </div>
      </form>
    </div>
  );
}
