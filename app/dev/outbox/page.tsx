import { notFound } from "next/navigation";
import { requirePageUser } from "@/lib/auth/current";
import { devOutboxEnabled } from "@/lib/mail/outbox";
import { teamOutbox } from "@/lib/db/outbox";
import { formatDateTime } from "@/lib/shared/dates";

export const dynamic = "force-dynamic";
export const metadata = { title: "Development outbox" };

/** Leads read here what the local mail fake received for their team (invitations, resets). Development only. */
export default async function OutboxPage() {
  if (!devOutboxEnabled()) notFound();
  const user = await requirePageUser("lead");
  const mail = await teamOutbox(user.teamId, 50, user.email);
  return (
    <main className="mx-auto max-w-4xl px-6 py-10">
      <h1 className="text-2xl font-semibold">Development outbox</h1>
      <p className="mt-1 text-sm text-ink-muted">Mail caught by the local SMTP fake for members and invitees of {user.teamName}. Nothing here left the machine.</p>
      <ol className="mt-6 space-y-4">
        {mail.length === 0 && <li className="text-sm text-ink-muted">No mail yet.</li>}
        {mail.map((m) => (
          <li key={m.id} className="rounded border border-hairline bg-white">
            <p className="border-b border-hairline px-4 py-2 text-sm">
              <span className="font-medium">{m.subject}</span> → {m.to} · <time dateTime={m.receivedAt}>{formatDateTime(m.receivedAt)}</time>
            </p>
            <pre className="num whitespace-pre-wrap px-4 py-3 text-xs">{m.text}</pre>
          </li>
        ))}
      </ol>
    </main>
  );
}
