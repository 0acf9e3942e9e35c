"use client";

export default function ScenarioError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-2xl px-6 py-10">
      <h1 className="text-xl font-semibold">The workbench stopped</h1>
      <p role="alert" className="mt-3 text-sm text-verdict-fail">{error.message || "An unexpected error occurred."}</p>
      <button type="button" onClick={reset} className="mt-4 rounded border border-hairline bg-white px-3 py-1.5 text-sm hover:bg-paper">
        Try again
      </button>
    </main>
  );
}
