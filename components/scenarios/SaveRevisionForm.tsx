"use client";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { SaveConflict, type ConflictingRevision, type SaveFn } from "./SaveConflict";
import { BUTTON_PRIMARY } from "@/components/shell/classes";

/**
 * Save a revision by editing the scenario as JSON (the workbench saves through the same server action). A stale
 * base shows both versions side by side and lets the user save theirs on top of the newer one deliberately.
 */
export function SaveRevisionForm({ scenarioId, baseRevisionId, baseNumber, body, save }: { scenarioId: string; baseRevisionId: string; baseNumber: number; body: unknown; save: SaveFn }) {
  const router = useRouter();
  const [text, setText] = useState(() => JSON.stringify(body, null, 2));
  const [note, setNote] = useState("");
  const [base, setBase] = useState({ id: baseRevisionId, number: baseNumber });
  const [err, setErr] = useState<{ field?: "body" | "note"; message: string } | null>(null);
  const [conflict, setConflict] = useState<ConflictingRevision | null>(null);
  const [saved, setSaved] = useState<number | null>(null);
  const [pending, start] = useTransition();

  function submit(e: React.FormEvent) {
    e.preventDefault();
    let parsed: unknown;
    try {
      parsed = JSON.parse(text);
    } catch (x) {
      setErr({ field: "body", message: `Not valid JSON: ${(x as Error).message}` });
      return;
    }
    setErr(null);
    start(async () => {
      const r = await save({ scenarioId, baseRevisionId: base.id, note, body: parsed });
      if (r.ok) {
        setSaved(r.number);
        setConflict(null);
        setBase({ id: r.revisionId, number: r.number });
        setNote("");
        router.refresh();
      } else {
        setErr({ message: r.message });
        if (r.conflict) setConflict({ ...r.conflict.current });
      }
    });
  }

  let mine: unknown = null;
  try {
    mine = JSON.parse(text);
  } catch {
    mine = null;
  }

  return (
    <form onSubmit={submit} className="rounded border border-hairline bg-white p-4" noValidate aria-labelledby="save-title">
      <h2 id="save-title" className="text-sm font-semibold">Save a new revision (on top of revision {base.number})</h2>
      <label htmlFor="rev-body" className="mt-3 block text-xs font-medium text-ink-muted">Scenario (JSON)</label>
      <textarea
        id="rev-body"
        value={text}
        onChange={(e) => setText(e.target.value)}
        rows={10}
        spellCheck={false}
        aria-invalid={err?.field === "body" ? true : undefined}
        aria-describedby={err?.field === "body" ? "rev-body-err" : undefined}
        className="num mt-1 w-full rounded border border-hairline px-2 py-1.5 text-xs aria-[invalid=true]:border-verdict-fail"
      />
      {err?.field === "body" && <p id="rev-body-err" className="text-xs text-verdict-fail">{err.message}</p>}
      <label htmlFor="rev-note" className="mt-3 block text-xs font-medium text-ink-muted">Note</label>
      <input id="rev-note" value={note} onChange={(e) => setNote(e.target.value)} maxLength={2000} placeholder="What changed and why" className="mt-1 w-full rounded border border-hairline px-2 py-1.5 text-sm" />
      <div className="mt-3 flex items-center gap-3">
        <button type="submit" disabled={pending} className={BUTTON_PRIMARY}>
          {pending ? "Saving…" : "Save revision"}
        </button>
        {saved !== null && !err && <p role="status" className="text-sm text-verdict-pass">Saved as revision {saved}.</p>}
      </div>
      {err && !err.field && <p role="alert" className="mt-2 text-sm text-verdict-fail">Not saved: {err.message}</p>}
      {conflict && (
        <SaveConflict current={conflict} mine={mine}>
          <button type="button" onClick={() => { setBase({ id: conflict.revisionId, number: conflict.number }); setConflict(null); setErr(null); }} className="rounded border border-hairline px-3 py-1 text-sm">
            Keep mine, save on top of revision {conflict.number}
          </button>
          <button type="button" onClick={() => { setText(JSON.stringify(conflict.body, null, 2)); setBase({ id: conflict.revisionId, number: conflict.number }); setConflict(null); setErr(null); }} className="rounded border border-hairline px-3 py-1 text-sm">
            Take theirs
          </button>
        </SaveConflict>
      )}
    </form>
  );
}
