import Link from "next/link";

/** Any address that names no page (HTTP 404). */
export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <p className="num text-sm text-ink-muted">404</p>
      <h1 className="mt-1 text-2xl font-semibold text-ink">No such page</h1>
      <p className="mt-3 text-ink-muted">The address may be mistyped, or what it pointed to was moved or deleted.</p>
      <nav className="mt-6 flex gap-4 text-sm" aria-label="Where to go">
        <Link href="/scenarios" className="text-signal underline">Scenarios</Link>
        <Link href="/library" className="text-signal underline">Library</Link>
        <Link href="/" className="text-signal underline">Home</Link>
      </nav>
    </main>
  );
}
