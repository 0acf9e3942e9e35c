"use client";

/**
 * What a page shows when something it needed failed after it had started (e.g. a form sent while the database was
 * unavailable: the server answered 503). What was typed elsewhere on the page is gone only if the page reloads.
 */
export default function PageError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <h1 className="text-2xl font-semibold">That did not go through</h1>
      <p role="alert" className="mt-3 text-ink-muted">
        The server could not finish the request. If the database is unavailable, try again in a few seconds.
      </p>
      {error.digest && <p className="mt-2 text-xs text-ink-muted">Reference: {error.digest}</p>}
      <button type="button" onClick={reset} className="mt-6 rounded border border-hairline bg-white px-3 py-1.5 text-sm hover:bg-paper">
        Try again
      </button>
    </main>
  );
}
