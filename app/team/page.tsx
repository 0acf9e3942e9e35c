import Link from "next/link";
import { requirePageUser } from "@/lib/auth/current";
import { listAudit } from "@/lib/db/audit";
import { TeamPanel } from "@/components/team/TeamPanel";
import { devOutboxEnabled } from "@/lib/mail/outbox";

export const dynamic = "force-dynamic";
export const metadata = { title: "Team" };

export default async function TeamPage() {
  const user = await requirePageUser("viewer");
  const isLead = user.role === "lead";
  const audit = isLead ? await listAudit(user.teamId, 30) : [];
  return (
    <main className="mx-auto max-w-5xl px-6 py-10">
      <div className="flex flex-wrap items-center gap-4">
        <h1 className="mr-auto text-2xl font-semibold">{user.teamName}</h1>
        {isLead && devOutboxEnabled() && <Link href="/dev/outbox" className="text-sm text-signal underline">Development outbox</Link>}
        <Link href="/team/new" className="text-sm text-signal underline">Start another team</Link>
      </div>
      <p className="mt-1 text-sm text-ink-muted">You are a {user.role} here.</p>
      <div className="mt-6">
        <TeamPanel meId={user.id} isLead={isLead} />
      </div>
      {isLead && (
        <section aria-labelledby="audit-title" className="mt-8 rounded border border-hairline bg-white">
          <h2 id="audit-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Recent activity</h2>
          <ul className="divide-y divide-hairline text-sm">
            {audit.map((a) => (
              <li key={a.id} className="flex justify-between px-4 py-1.5">
                <span>
                  <span className="font-medium">{a.actorName ?? "someone"}</span> · {a.action}
                </span>
                <time className="text-ink-muted" dateTime={a.createdAt}>{new Date(a.createdAt).toUTCString()}</time>
              </li>
            ))}
          </ul>
        </section>
      )}
    </main>
  );
}
