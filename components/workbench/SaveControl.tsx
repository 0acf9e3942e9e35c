"use client";
/**
 * Save the scenario as a new revision with a note. A save on a stale base revision comes back as a conflict: both
 * versions' differing values are shown, and the person chooses to open theirs or to save theirs-plus-mine on top.
 * A save that could not reach the server or the database keeps the edits (they stay in the store, still unsaved)
 * and offers to send the same save again.
 */
import { useCallback, useRef, useState } from "react";
import { upgradeScenario } from "@/lib/design/upgrade";
import type { Scenario } from "@/lib/design/schema";
import { SaveConflict, type ConflictingRevision, type SaveFn } from "@/components/scenarios/SaveConflict";
import { useWb, useWbStore } from "./context";
import { TOOL_BUTTON, TOOL_BUTTON_PRIMARY } from "@/components/shell/classes";
import { useDismissable } from "@/components/shell/useDismissable";

export type { SaveFn };

const BTN = TOOL_BUTTON;

export function SaveControl({ scenarioId, revisionId, save, onSaved }: {
  scenarioId: string | null; revisionId: string | null; save: SaveFn | null; onSaved?: (revisionId: string, revisionNumber: number) => void;
}) {
  const store = useWbStore();
  const dirty = useWb((s) => s.dirty);
  const [open, setOpen] = useState(false);
  const [note, setNote] = useState("");
  const [base, setBase] = useState(revisionId);
  const [busy, setBusy] = useState(false);
  const [msg, setMsg] = useState<string | null>(null);
  /** The base revision of a save that failed for want of the server or the database (offered again), else null. */
  const [retryBase, setRetryBase] = useState<string | null>(null);
  const [conflict, setConflict] = useState<{ current: ConflictingRevision; theirs: Scenario | null; mine: Scenario } | null>(null);
  const openButton = useRef<HTMLButtonElement>(null);
  const panel = useRef<HTMLDivElement>(null);
  const close = useCallback(() => setOpen(false), []);
  useDismissable(open, panel, openButton, close);

  if (!save && scenarioId) {
    return <span className="text-[12px] text-ink-muted" title="Your role can read and comment; edits here are not saved">Read only</span>;
  }
  if (!save || !scenarioId || !base) {
    return <span className="text-[12px] text-ink-muted" title="This scenario is a local draft: it is not saved anywhere">Local draft</span>;
  }

  const doSave = async (baseRevisionId: string) => {
    setBusy(true);
    setMsg(null);
    setRetryBase(null);
    const body = store.getState().scenario;
    try {
      const r = await save({ scenarioId, baseRevisionId, note, body });
      if (r.ok) {
        setBase(r.revisionId);
        store.getState().markSaved(body);
        setConflict(null);
        setOpen(false);
        setNote("");
        setMsg(`Saved as revision ${r.number}`);
        onSaved?.(r.revisionId, r.number);
      } else if (r.conflict) {
        const c = r.conflict.current;
        let theirs: Scenario | null = null;
        try {
          theirs = upgradeScenario(c.body);
        } catch {
          theirs = null;
        }
        setConflict({ current: { ...c, body: theirs ?? c.body }, theirs, mine: body });
        setMsg(r.message);
      } else {
        setMsg(r.message);
        if (r.retry) setRetryBase(baseRevisionId);
      }
    } catch {
      // The server answered 503 (database down) or could not be reached: nothing was saved, the edits are kept.
      setMsg("The save did not reach the database: your edits are kept here. Try again in a moment.");
      setRetryBase(baseRevisionId);
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="relative">
      <button ref={openButton} type="button" className={`${BTN} ${dirty ? "border-signal text-signal" : ""}`} onClick={() => setOpen((o) => !o)} aria-expanded={open} data-testid="save-open">
        Save…
      </button>
      {msg && !open && <span className="ml-2 text-[12px] text-ink-muted" role="status">{msg}</span>}
      {open && (
        <div className={`absolute right-0 z-40 mt-1 ${conflict ? "w-[min(36rem,calc(100vw-1.5rem))]" : "w-[min(24rem,calc(100vw-1.5rem))]"} rounded border border-hairline bg-white p-3 shadow-lg`} ref={panel} role="dialog" aria-label="Save revision" data-testid="save-popover">
          <label htmlFor="save-note" className="text-[12px] font-semibold">Note for this revision</label>
          <textarea id="save-note" className="mt-1 w-full rounded border border-hairline p-1.5 text-[13px]" rows={2} maxLength={2000} value={note} onChange={(e) => setNote(e.target.value)} data-testid="save-note" />
          <div className="mt-2 flex justify-end gap-2">
            <button type="button" className={BTN} onClick={() => { setOpen(false); openButton.current?.focus(); }}>Close</button>
            <button type="button" className={TOOL_BUTTON_PRIMARY} disabled={busy} onClick={() => doSave(base)} data-testid="save-submit">
              {busy ? "Saving…" : "Save revision"}
            </button>
          </div>
          {msg && <p className="mt-2 text-[12px] text-verdict-fail" role="alert" data-testid="save-message">{msg}</p>}
          {retryBase && (
            <button type="button" className={`${BTN} mt-1`} disabled={busy} onClick={() => doSave(retryBase)} data-testid="save-retry">
              Try the save again
            </button>
          )}
          {conflict && (
            <SaveConflict current={conflict.current} mine={conflict.mine}>
              {conflict.theirs && (
                <button type="button" className={BTN} onClick={() => { store.getState().load(conflict.theirs!); setBase(conflict.current.revisionId); setConflict(null); setMsg(`Opened revision ${conflict.current.number}`); onSaved?.(conflict.current.revisionId, conflict.current.number); }}>
                  Open theirs (drop mine)
                </button>
              )}
              <button type="button" className={BTN} onClick={() => doSave(conflict.current.revisionId)}>Save mine on top</button>
            </SaveConflict>
          )}
        </div>
      )}
    </div>
  );
}
