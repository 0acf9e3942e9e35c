import Link from "next/link";

/** Rendered with HTTP 404 for unknown addresses and for pages a visitor may not know exist (another team's). */
export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <h1 className="text-2xl font-semibold">Not found</h1>
      <p className="mt-3 text-ink-muted">There is nothing here: it may have been deleted, or the address is mistyped.</p>
      <Link href="/scenarios" className="mt-6 inline-block text-signal underline">Back to scenarios</Link>
    </main>
  );
}
