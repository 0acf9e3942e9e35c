import Link from "next/link";
import { requirePageUser } from "@/lib/auth/current";
import { listAudit } from "@/lib/db/audit";
import { TeamPanel } from "@/components/team/TeamPanel";
import { devOutboxEnabled } from "@/lib/mail/outbox";
import { formatDateTime } from "@/lib/shared/dates";

export const dynamic = "force-dynamic";
export const metadata = { title: "Team" };

/** The audit log's action codes in plain words; an unknown code shows as it is. */
const ACTION_WORDS: Record<string, string> = {
  "comment.add": "commented on a revision",
  "invitation.accept": "accepted an invitation",
  "invitation.create": "sent an invitation",
  "invitation.revoke": "revoked an invitation",
  "library.start_from": "started a scenario from a Library entry",
  "library.tolerances": "changed the bench-comparison tolerances",
  "member.remove": "removed a member",
  "member.role": "changed a member's role",
  "part.create": "added a part",
  "part.retire": "retired a part",
  "part.version": "saved a new version of a part",
  "revision.save": "saved a revision",
  "scenario.create": "created a scenario",
  "scenario.delete": "deleted a scenario",
  "scenario.fork": "forked a scenario",
  "scenario.restore": "restored a scenario",
  "scenario.update": "updated a scenario",
  "team.create": "started the team",
  "trace.delete": "deleted a bench trace",
  "trace.upload": "uploaded a bench trace",
  "user.password_reset": "reset a password",
  "user.sign_up": "signed up",
  "share_link.create": "made a public share link",
  "share_link.revoke": "revoked a public share link",
  "library.created": "created a Library entry",
  "library.submitted": "submitted a design to the Library",
  "library.returned": "returned a Library entry with comments",
  "library.validated": "validated a Library entry",
  "library.retired": "retired a Library entry",
  "library.withdrawn": "withdrew a Library entry",
  "library.commented": "commented on a Library entry",
};

/** An action without words of its own still reads as words ("share_link.renew" → "share link renew"). */
const actionWords = (code: string) => ACTION_WORDS[code] ?? `did: ${code.replace(/[._]+/g, " ")}`;

export default async function TeamPage() {
  const user = await requirePageUser("viewer");
  const isLead = user.role === "lead";
  const audit = isLead ? await listAudit(user.teamId, 30) : [];
  return (
    <main className="mx-auto max-w-5xl px-6 py-10">
      <div className="flex flex-wrap items-center gap-4">
        <h1 className="mr-auto text-2xl font-semibold">{user.teamName}</h1>
        {isLead && devOutboxEnabled() && <Link href="/dev/outbox" className="text-sm text-signal underline">Development outbox</Link>}
        <Link href="/team/parts" className="text-sm text-signal underline" data-testid="team-parts-link">Parts</Link>
        <Link href="/team/new" className="text-sm text-signal underline">Start another team</Link>
      </div>
      <p className="mt-1 text-sm text-ink-muted">You are a {user.role} here.</p>
      <div className="mt-6">
        <TeamPanel meId={user.id} isLead={isLead} />
      </div>
      {isLead && (
        <section aria-labelledby="audit-title" className="mt-8 rounded border border-hairline bg-white">
          <h2 id="audit-title" className="border-b border-hairline px-4 py-2 text-sm font-semibold">Recent activity</h2>
          {audit.length === 0 && <p className="px-4 py-3 text-sm text-ink-muted">No activity yet.</p>}
          <ul className="divide-y divide-hairline text-sm">
            {audit.map((a) => (
              <li key={a.id} className="flex justify-between px-4 py-1.5">
                <span>
                  <span className="font-medium">{a.actorName ?? "someone"}</span> {actionWords(a.action)}
                </span>
                <time className="text-ink-muted" dateTime={a.createdAt}>{formatDateTime(a.createdAt)}</time>
              </li>
            ))}
          </ul>
        </section>
      )}
    </main>
  );
}
