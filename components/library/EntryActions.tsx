"use client";
/**
 * What the signed-in member may do with an entry: a lead validates, returns with comments or retires; the submitter
 * withdraws; anyone comments; designers start a new scenario from a validated entry. The server checks every one.
 */
import { useActionState, useState } from "react";
import { useRouter } from "next/navigation";
import type { ActionState } from "@/lib/auth/action-state";

export function EntryActions(props: {
  entryId: string;
  status: string;
  /** What is wrong with the evidence (a failed or missing comparison), or null: validating then needs a reason. */
  evidenceProblem: string | null;
  role: "viewer" | "designer" | "lead";
  isSubmitter: boolean;
  startAction: (s: ActionState, f: FormData) => Promise<ActionState>;
  defaultTitle: string;
}) {
  const router = useRouter();
  const [comment, setComment] = useState("");
  const [overrideReason, setOverrideReason] = useState("");
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [startState, startFormAction, starting] = useActionState(props.startAction, {});

  async function patch(body: Record<string, unknown>, done: string) {
    setBusy(true);
    setMessage(null);
    try {
      const r = await fetch(`/api/library/${props.entryId}`, { method: "PATCH", headers: { "content-type": "application/json" }, body: JSON.stringify(body) });
      const out = await r.json().catch(() => ({}));
      if (!r.ok) {
        const fe = out.fieldErrors ? Object.values(out.fieldErrors as Record<string, string[]>)[0]?.[0] : null;
        setMessage({ ok: false, text: fe ?? out.error ?? `HTTP ${r.status}` });
        return;
      }
      setMessage({ ok: true, text: out.mailFailures?.length ? `${done} (mail could not reach ${out.mailFailures.join(", ")})` : done });
      setComment("");
      router.refresh();
    } finally {
      setBusy(false);
    }
  }

  const lead = props.role === "lead";
  const btn = "rounded px-3 py-1.5 text-sm font-medium disabled:opacity-50";
  return (
    <div className="space-y-3 no-print" data-testid="entry-actions">
      <label className="flex flex-col text-sm">
        <span className="text-xs text-ink-muted">Comment {lead && props.status === "submitted" ? "(required to return it)" : ""}</span>
        <textarea className="rounded border border-hairline p-2" rows={3} value={comment} maxLength={4000} onChange={(e) => setComment(e.target.value)} aria-label="Comment" />
      </label>
      <div className="flex flex-wrap gap-2">
        {lead && props.status === "submitted" && (
          <>
            {props.evidenceProblem ? (
              <div className="w-full space-y-2 rounded border border-verdict-fail/30 bg-red-50 p-2" data-testid="override-form">
                <p className="text-sm text-verdict-fail">The evidence does not support validation: {props.evidenceProblem}. Validate only with an override and a written reason; it is kept on the entry, in the review, the mail and the audit log.</p>
                <label className="flex flex-col text-sm">
                  <span className="text-xs text-ink-muted">Override reason (at least 10 characters)</span>
                  <textarea className="rounded border border-hairline p-2" rows={2} value={overrideReason} maxLength={4000} onChange={(e) => setOverrideReason(e.target.value)} aria-label="Override reason" />
                </label>
                <button type="button" disabled={busy || overrideReason.trim().length < 10} className={`${btn} bg-verdict-fail text-white`} onClick={() => void patch({ status: "validated", comment, overrideReason }, "Validated with an override.")}>Validate with override</button>
              </div>
            ) : (
              <button type="button" disabled={busy} className={`${btn} bg-verdict-pass text-white`} onClick={() => void patch({ status: "validated", comment }, "Validated.")}>Validate</button>
            )}
            <button type="button" disabled={busy} className={`${btn} border border-verdict-warn text-verdict-warn`} onClick={() => void patch({ status: "draft", comment }, "Returned with comments.")}>Return with comments</button>
          </>
        )}
        {lead && props.status !== "retired" && (
          <button type="button" disabled={busy} className={`${btn} border border-hairline text-ink-muted`} onClick={() => void patch({ status: "retired", comment }, "Retired.")}>Retire</button>
        )}
        {!lead && props.isSubmitter && props.status === "submitted" && (
          <button type="button" disabled={busy} className={`${btn} border border-hairline`} onClick={() => void patch({ withdraw: true, comment }, "Withdrawn.")}>Withdraw</button>
        )}
        <button type="button" disabled={busy || !comment.trim()} className={`${btn} border border-signal text-signal`} onClick={() => void patch({ comment }, "Comment added.")}>Add comment</button>
      </div>
      {message && <p role={message.ok ? "status" : "alert"} className={`text-sm ${message.ok ? "text-verdict-pass" : "text-verdict-fail"}`} data-testid="entry-message">{message.text}</p>}
      {props.status === "validated" && props.role !== "viewer" && (
        <form action={startFormAction} className="flex flex-wrap items-end gap-2 border-t border-hairline pt-3 text-sm">
          <input type="hidden" name="entryId" value={props.entryId} />
          <label className="flex flex-col">
            <span className="text-xs text-ink-muted">New scenario title</span>
            <input name="title" defaultValue={props.defaultTitle} className="w-72 rounded border border-hairline px-2 py-1" aria-label="New scenario title" />
          </label>
          <button type="submit" disabled={starting} className={`${btn} bg-signal text-white`}>Start from this</button>
          {startState.message && <span role="alert" className="text-verdict-fail">{startState.message}</span>}
        </form>
      )}
    </div>
  );
}
