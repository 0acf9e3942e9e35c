import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { openPublicLink } from "@/lib/db/shareLinks";
import { currentUser, roleAtLeast } from "@/lib/auth/current";
import { templateTitle } from "@/components/scenarios/RevisionView";
import { SharedRevision } from "@/components/scenarios/SharedRevision";
import { OpenCopyButton } from "@/components/scenarios/ScenarioButtons";
import { BUTTON } from "@/components/shell/classes";
import { formatDate, formatDateTime } from "@/lib/shared/dates";
import { copySharedRevision } from "./actions";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Shared scenario", robots: { index: false, follow: false }, referrer: "no-referrer" };

/**
 * A public read-only link: anyone holding the token sees one revision — its schematic, step response, loop gain,
 * headline figures and checks, simulated in the visitor's browser — and a signed-in designer or lead may open a copy
 * in their own team. An unknown, expired or revoked link answers 404 (not-found.tsx), decided before anything streams.
 */
export default async function PublicSharePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await openPublicLink(token);
  if (link.state !== "active") notFound();
  const user = await currentUser().catch(() => null);
  const r = link.revision;
  return (
    <main className="mx-auto max-w-6xl px-4 py-8 sm:px-6">
      <p className="text-sm text-ink-muted">Public read-only link · valid until {formatDate(link.expiresAt)}</p>
      <div className="mt-1 flex flex-wrap items-center gap-3">
        <h1 className="mr-auto text-2xl font-semibold">
          {r.scenarioTitle} <span className="num text-ink-muted">· revision {r.number}</span>
        </h1>
        {user && roleAtLeast(user.role, "designer") && <OpenCopyButton token={token} copy={copySharedRevision} />}
        {!user && <Link href={`/sign-in?next=${encodeURIComponent(`/share/p/${token}`)}`} className={BUTTON}>Sign in to open a copy</Link>}
      </div>
      <p className="mt-1 text-sm text-ink-muted">Saved by {r.authorName} on {formatDateTime(r.createdAt)} · {templateTitle(r.template)}</p>
      {r.note && <p className="mt-3 rounded border border-hairline bg-white px-4 py-2 text-sm">“{r.note}”</p>}
      <div className="mt-6">
        <SharedRevision body={r.body} />
      </div>
    </main>
  );
}
