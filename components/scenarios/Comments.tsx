"use client";
import { useState } from "react";
import useSWR from "swr";
import { ago, fetcher, send, type FetchError } from "./fetcher";
import { Loading, LoadError } from "./Status";
import { formatDateTime } from "@/lib/shared/dates";

interface Comment {
  id: string;
  revisionNumber: number | null;
  authorName: string;
  body: string;
  createdAt: string;
}

/** The scenario's comments (every member may write one), optionally tied to the revision on screen. */
export function Comments({ scenarioId, revisionId }: { scenarioId: string; revisionId?: string }) {
  const url = `/api/scenarios/${scenarioId}/comments`;
  const { data, error, isLoading, mutate } = useSWR<{ comments: Comment[] }, FetchError>(url, fetcher);
  const [text, setText] = useState("");
  const [err, setErr] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    if (!text.trim()) {
      setErr("Write a comment first.");
      return;
    }
    setBusy(true);
    setErr(null);
    try {
      await send(url, "POST", { body: text, ...(revisionId ? { revisionId } : {}) });
      setText("");
      await mutate();
    } catch (x) {
      setErr((x as Error).message);
    } finally {
      setBusy(false);
    }
  }

  return (
    <section aria-labelledby="comments-title" className="self-start rounded border border-hairline bg-white">
      <h2 id="comments-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Comments</h2>
      {error ? (
        <LoadError error={error} retry={() => mutate()} />
      ) : isLoading ? (
        <Loading what="comments" />
      ) : (
        <ol className="divide-y divide-hairline" data-testid="comments">
          {data?.comments.length === 0 && <li className="px-4 py-3 text-sm text-ink-muted">No comments yet.</li>}
          {data?.comments.map((c) => (
            <li key={c.id} className="px-4 py-3 text-sm">
              <p className="text-xs text-ink-muted">
                <span className="font-medium text-ink">{c.authorName}</span> · <time dateTime={c.createdAt} title={formatDateTime(c.createdAt)}>{ago(c.createdAt)}</time>
                {c.revisionNumber !== null && <> · on revision {c.revisionNumber}</>}
              </p>
              <p className="mt-1 whitespace-pre-wrap">{c.body}</p>
            </li>
          ))}
        </ol>
      )}
      <form onSubmit={submit} className="border-t border-hairline p-4" noValidate>
        <label htmlFor="comment-body" className="text-sm font-medium">Add a comment</label>
        <textarea
          id="comment-body"
          value={text}
          onChange={(e) => setText(e.target.value)}
          rows={3}
          maxLength={4000}
          aria-invalid={err ? true : undefined}
          aria-describedby={err ? "comment-err" : undefined}
          className="mt-1 w-full rounded border border-hairline px-2 py-1.5 text-sm aria-[invalid=true]:border-verdict-fail"
        />
        {err && <p id="comment-err" role="alert" className="text-xs text-verdict-fail">{err}</p>}
        <button type="submit" disabled={busy} className="mt-2 rounded bg-signal px-3 py-1.5 text-sm font-medium text-white hover:bg-signal-dark disabled:opacity-60">
          {busy ? "Posting…" : "Post comment"}
        </button>
      </form>
    </section>
  );
}
