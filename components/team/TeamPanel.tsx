"use client";
import { useState } from "react";
import useSWR from "swr";
import { ago, fetcher, send, FetchError } from "@/components/scenarios/fetcher";
import { Loading, LoadError } from "@/components/scenarios/Status";
import { BUTTON_PRIMARY, FIELD } from "@/components/shell/classes";
import { formatDate } from "@/lib/shared/dates";

type Role = "viewer" | "designer" | "lead";
interface Member { userId: string; name: string; email: string; role: Role; joinedAt: string }
interface Invitation { id: string; email: string; role: Role; invitedBy: string | null; expiresAt: string; createdAt: string; status: string }

/** Members with their roles; leads change roles, remove members, invite by e-mail and withdraw invitations. */
export function TeamPanel({ meId, isLead }: { meId: string; isLead: boolean }) {
  const members = useSWR<{ members: Member[] }, FetchError>("/api/team/members", fetcher);
  const invites = useSWR<{ invitations: Invitation[] }, FetchError>(isLead ? "/api/team/invitations" : null, fetcher);
  const [err, setErr] = useState<string | null>(null);

  async function act(fn: () => Promise<unknown>) {
    setErr(null);
    try {
      await fn();
      await Promise.all([members.mutate(), invites.mutate()]);
    } catch (x) {
      setErr((x as Error).message);
    }
  }

  return (
    <div className="space-y-8">
      {err && <p role="alert" className="rounded border border-verdict-fail/30 bg-red-50 px-3 py-2 text-sm text-verdict-fail">Not done: {err}</p>}
      <section aria-labelledby="members-title" className="overflow-x-auto rounded border border-hairline bg-white">
        <h2 id="members-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Members</h2>
        {members.error ? (
          <LoadError error={members.error} retry={() => members.mutate()} />
        ) : !members.data ? (
          <Loading what="members" />
        ) : (
          <table className="w-full text-sm">
            <thead className="text-xs uppercase tracking-wide text-ink-muted">
              <tr>
                <th scope="col" className="px-4 py-2 text-left font-medium">Name</th>
                <th scope="col" className="px-4 py-2 text-left font-medium">E-mail</th>
                <th scope="col" className="px-4 py-2 text-left font-medium">Role</th>
                <th scope="col" className="px-4 py-2 text-left font-medium">Joined</th>
                {isLead && <th scope="col" className="px-4 py-2"><span className="sr-only">Actions</span></th>}
              </tr>
            </thead>
            <tbody className="divide-y divide-hairline">
              {members.data.members.map((m) => (
                <tr key={m.userId}>
                  <td className="px-4 py-1.5">{m.name}{m.userId === meId && <span className="text-ink-muted"> (you)</span>}</td>
                  <td className="px-4 py-1.5 text-ink-muted">{m.email}</td>
                  <td className="px-4 py-1.5">
                    {isLead ? (
                      <>
                        <label htmlFor={`role-${m.userId}`} className="sr-only">Role of {m.name}</label>
                        <select
                          id={`role-${m.userId}`}
                          value={m.role}
                          onChange={(e) => act(() => send("/api/team/members", "PATCH", { userId: m.userId, role: e.target.value }))}
                          className={FIELD}
                        >
                          <option value="viewer">viewer</option>
                          <option value="designer">designer</option>
                          <option value="lead">lead</option>
                        </select>
                      </>
                    ) : (
                      m.role
                    )}
                  </td>
                  <td className="px-4 py-1.5 text-ink-muted">{ago(m.joinedAt)}</td>
                  {isLead && (
                    <td className="px-4 py-1.5 text-right">
                      <button
                        type="button"
                        onClick={() => {
                          if (window.confirm(`Remove ${m.name} from the team?`)) void act(() => send(`/api/team/members?userId=${m.userId}`, "DELETE"));
                        }}
                        className="text-xs text-verdict-fail underline"
                      >
                        Remove
                      </button>
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </section>

      {isLead && (
        <section aria-labelledby="inv-title" className="overflow-x-auto rounded border border-hairline bg-white">
          <h2 id="inv-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Invitations</h2>
          <InviteForm onSent={() => invites.mutate()} />
          {invites.error ? (
            <LoadError error={invites.error} retry={() => invites.mutate()} />
          ) : !invites.data ? (
            <Loading what="invitations" />
          ) : (
            <ul className="divide-y divide-hairline border-t border-hairline text-sm" data-testid="invitations">
              {invites.data.invitations.length === 0 && <li className="px-4 py-3 text-ink-muted">No invitations yet.</li>}
              {invites.data.invitations.map((i) => (
                <li key={i.id} className="flex items-center justify-between px-4 py-1.5">
                  <span>
                    {i.email} · {i.role} · <span className={i.status === "pending" ? "" : "text-ink-muted"}>{i.status}</span>
                    {i.status === "pending" && <span className="text-ink-muted"> · until {formatDate(i.expiresAt)}</span>}
                  </span>
                  {i.status === "pending" && (
                    <button type="button" onClick={() => act(() => send(`/api/team/invitations?id=${i.id}`, "DELETE"))} className="text-xs text-verdict-fail underline">
                      Withdraw
                    </button>
                  )}
                </li>
              ))}
            </ul>
          )}
        </section>
      )}
    </div>
  );
}

function InviteForm({ onSent }: { onSent: () => void }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [msg, setMsg] = useState<{ ok: boolean; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = e.currentTarget;
    const fd = new FormData(form);
    setBusy(true);
    setErrors({});
    setMsg(null);
    try {
      const r = await send<{ mailSent: boolean }>("/api/team/invitations", "POST", { email: fd.get("email"), role: fd.get("role") });
      setMsg({ ok: true, text: r.mailSent ? "Invitation sent." : "Invitation stored, but the e-mail could not be sent: try again later." });
      form.reset();
      onSent();
    } catch (x) {
      const data = x instanceof FetchError ? (x.data as { fieldErrors?: Record<string, string[]> }) : undefined;
      setErrors(data?.fieldErrors ?? {});
      setMsg({ ok: false, text: (x as Error).message });
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="flex flex-wrap items-end gap-3 p-4" noValidate>
      <div className="flex flex-col gap-1">
        <label htmlFor="inv-email" className="text-xs font-medium text-ink-muted">E-mail</label>
        <input id="inv-email" name="email" type="email" required aria-invalid={errors.email ? true : undefined} aria-describedby={errors.email ? "inv-email-err" : undefined} className="w-72 rounded border border-hairline px-2 py-1.5 text-sm aria-[invalid=true]:border-verdict-fail" />
        {errors.email && <p id="inv-email-err" className="text-xs text-verdict-fail">{errors.email.join(" ")}</p>}
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor="inv-role" className="text-xs font-medium text-ink-muted">Role</label>
        <select id="inv-role" name="role" defaultValue="designer" className="rounded border border-hairline bg-white px-2 py-1.5 text-sm">
          <option value="viewer">viewer</option>
          <option value="designer">designer</option>
          <option value="lead">lead</option>
        </select>
      </div>
      <button type="submit" disabled={busy} className={BUTTON_PRIMARY}>
        {busy ? "Sending…" : "Invite"}
      </button>
      {msg && <p role={msg.ok ? "status" : "alert"} className={`w-full text-sm ${msg.ok ? "text-verdict-pass" : "text-verdict-fail"}`}>{msg.ok ? msg.text : `Not done: ${msg.text}`}</p>}
    </form>
  );
}
