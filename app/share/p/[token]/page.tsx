import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { openPublicLink } from "@/lib/db/shareLinks";
import { RevisionView } from "@/components/scenarios/RevisionView";
import { templateTitle } from "@/components/scenarios/RevisionView";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Shared scenario", robots: { index: false, follow: false }, referrer: "no-referrer" };

/**
 * A public read-only link: anyone holding the token sees one revision. An unknown, expired or revoked link answers
 * 404 (not-found.tsx), decided before anything streams.
 */
export default async function PublicSharePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const link = await openPublicLink(token);
  if (link.state !== "active") notFound();
  const r = link.revision;
  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <p className="text-sm text-ink-muted">Public read-only link · valid until {new Date(link.expiresAt).toUTCString()}</p>
      <h1 className="mt-1 text-2xl font-semibold">
        {r.scenarioTitle} <span className="num text-ink-muted">· revision {r.number}</span>
      </h1>
      <p className="mt-1 text-sm text-ink-muted">Saved by {r.authorName} on {new Date(r.createdAt).toUTCString()} · {templateTitle(r.template)}</p>
      {r.note && <p className="mt-3 rounded border border-hairline bg-white px-4 py-2 text-sm">“{r.note}”</p>}
      <div className="mt-6">
        <RevisionView body={r.body} />
      </div>
    </main>
  );
}
