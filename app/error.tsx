"use client";

import Link from "next/link";

/**
 * An unexpected failure while rendering a page (expected refusals come back as messages, never here). The server
 * keeps the details in its log; the page shows the reference that finds them there.
 */
export default function RootError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-xl px-6 py-16">
      <h1 className="text-2xl font-semibold text-ink">This page stopped</h1>
      <p role="alert" className="mt-3 text-ink-muted">
        Something unexpected interrupted it. Nothing you saved is lost; try again, or come back in a moment.
      </p>
      {error.digest && (
        <p className="mt-2 text-sm text-ink-muted">
          Reference for the server log: <span className="num text-ink">{error.digest}</span>
        </p>
      )}
      <div className="mt-6 flex items-center gap-4 text-sm">
        <button type="button" onClick={reset} className="rounded bg-signal px-3 py-1.5 font-medium text-white hover:bg-signal-dark">
          Try again
        </button>
        <Link href="/scenarios" className="text-signal underline">Scenarios</Link>
      </div>
    </main>
  );
}
