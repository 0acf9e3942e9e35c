"use client";
import { useRef, useState } from "react";
import useSWR from "swr";
import { fetcher, send, type FetchError } from "./fetcher";
import { Loading, LoadError } from "./Status";
import { BUTTON, FIELD, TOOL_BUTTON } from "@/components/shell/classes";
import { formatDate } from "@/lib/shared/dates";

interface Link {
  id: string;
  revisionNumber: number;
  createdBy: string | null;
  expiresAt: string;
  state: "active" | "revoked" | "expired";
}

/**
 * "Share link": the team link to one revision (members only, read-only with fork), and — for the owner or a
 * lead — public read-only links with an expiry, listed with their state and revocable.
 */
export function ShareDialog({ scenarioId, revisionId, revisionNumber, canPublish, publicUrl, compact = false }: {
  scenarioId: string; revisionId: string; revisionNumber: number; canPublish: boolean;
  /** The site's configured public base URL (QUELL_PUBLIC_URL), so the team link matches the links in e-mails. */
  publicUrl: string;
  compact?: boolean;
}) {
  const dialog = useRef<HTMLDialogElement>(null);
  const [open, setOpen] = useState(false);
  const [copied, setCopied] = useState<string | null>(null);
  const [fresh, setFresh] = useState<string | null>(null);
  const [days, setDays] = useState("14");
  const [err, setErr] = useState<string | null>(null);
  const teamLink = `${publicUrl.replace(/\/+$/, "")}/share/r/${revisionId}`;
  const url = `/api/scenarios/${scenarioId}/share-links`;
  const { data, error, isLoading, mutate } = useSWR<{ links: Link[] }, FetchError>(open ? url : null, fetcher);

  async function copy(text: string, what: string) {
    try {
      await navigator.clipboard.writeText(text);
      setCopied(what);
    } catch {
      setCopied(null);
      setErr("Could not reach the clipboard: select the link and copy it.");
    }
  }
  async function publish() {
    setErr(null);
    try {
      const r = await send<{ url: string }>(url, "POST", { revisionId, days: Number(days) });
      setFresh(r.url);
      await mutate();
    } catch (x) {
      setErr((x as Error).message);
    }
  }
  async function revoke(id: string) {
    setErr(null);
    try {
      await send(`${url}?id=${id}`, "DELETE");
      await mutate();
    } catch (x) {
      setErr((x as Error).message);
    }
  }

  return (
    <>
      <button
        type="button"
        onClick={() => {
          setOpen(true);
          dialog.current?.showModal();
        }}
        className={compact ? `${TOOL_BUTTON} text-ink` : BUTTON}
        data-testid="share-open"
      >
        Share link
      </button>
      <dialog ref={dialog} onClose={() => setOpen(false)} aria-labelledby="share-title" data-testid="share-dialog" className="fixed inset-0 m-auto h-fit max-h-[90vh] w-[calc(100vw-2rem)] max-w-lg overflow-y-auto rounded border border-hairline bg-white p-0 text-ink shadow-xl backdrop:bg-ink/30">
        <div className="p-5">
          <h2 id="share-title" className="text-lg font-semibold">Share revision {revisionNumber}</h2>
          <label htmlFor="team-link" className="mt-4 block text-sm font-medium">Team link (members of your team, read-only)</label>
          <div className="mt-1 flex gap-2">
            <input id="team-link" readOnly value={teamLink} onFocus={(e) => e.currentTarget.select()} className="num w-full rounded border border-hairline px-2 py-1 text-xs" />
            <button type="button" onClick={() => copy(teamLink, "team")} className="rounded bg-signal px-3 py-1 text-sm text-white hover:bg-signal-dark">Copy link</button>
          </div>
          {copied === "team" && <p role="status" className="mt-1 text-xs text-verdict-pass">Copied.</p>}

          <h3 className="mt-6 text-sm font-semibold">Public read-only links</h3>
          {canPublish ? (
            <div className="mt-2 flex items-end gap-2">
              <div className="flex flex-col gap-1">
                <label htmlFor="link-days" className="text-xs text-ink-muted">Expires after</label>
                <select id="link-days" value={days} onChange={(e) => setDays(e.target.value)} className={FIELD}>
                  {["1", "7", "14", "30", "90"].map((d) => <option key={d} value={d}>{d} day{d === "1" ? "" : "s"}</option>)}
                </select>
              </div>
              <button type="button" onClick={publish} className="rounded border border-hairline px-3 py-1 text-sm hover:border-signal">Create public link</button>
            </div>
          ) : (
            <p className="mt-1 text-xs text-ink-muted">Only the owner or a lead can make a public link.</p>
          )}
          {fresh && (
            <div className="mt-3">
              <label htmlFor="public-link" className="block text-xs font-medium">New public link (shown once: copy it now)</label>
              <div className="mt-1 flex gap-2">
                <input id="public-link" readOnly value={fresh} onFocus={(e) => e.currentTarget.select()} className="num w-full rounded border border-hairline px-2 py-1 text-xs" />
                <button type="button" onClick={() => copy(fresh, "public")} className="rounded bg-signal px-3 py-1 text-sm text-white">Copy</button>
              </div>
              {copied === "public" && <p role="status" className="mt-1 text-xs text-verdict-pass">Copied.</p>}
            </div>
          )}
          {err && <p role="alert" className="mt-2 text-sm text-verdict-fail">Not done: {err}</p>}
          {open &&
            (error ? (
              <LoadError error={error} retry={() => mutate()} />
            ) : isLoading ? (
              <Loading what="links" />
            ) : (
              <ul className="mt-3 divide-y divide-hairline text-sm">
                {data?.links.map((l) => (
                  <li key={l.id} className="flex items-center justify-between py-1.5">
                    <span>
                      Revision {l.revisionNumber} · {l.state === "active" ? `until ${formatDate(l.expiresAt)}` : l.state}
                      {l.createdBy ? ` · by ${l.createdBy}` : ""}
                    </span>
                    {l.state === "active" && canPublish && (
                      <button type="button" onClick={() => revoke(l.id)} className="text-xs text-verdict-fail underline">Revoke</button>
                    )}
                  </li>
                ))}
              </ul>
            ))}
          <div className="mt-5 text-right">
            <button type="button" onClick={() => dialog.current?.close()} className="rounded border border-hairline px-3 py-1.5 text-sm">Close</button>
          </div>
        </div>
      </dialog>
    </>
  );
}
