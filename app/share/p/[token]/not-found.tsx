/** HTTP 404 for a public link that is unknown, expired or revoked (the page does not say which). */
export default function PublicLinkNotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <h1 className="text-2xl font-semibold">Shared scenario</h1>
      <p role="alert" className="mt-3">This link is not valid: it may have expired, or the people who shared it revoked it.</p>
      <p className="mt-2 text-sm text-ink-muted">Ask whoever sent it for a new link.</p>
    </main>
  );
}
