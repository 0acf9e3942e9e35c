import Link from "next/link";

export default function ScenarioNotFound() {
  return (
    <main className="mx-auto max-w-2xl px-6 py-10">
      <h1 className="text-xl font-semibold">No such scenario</h1>
      <p className="mt-3 text-sm text-ink-muted">It may have been deleted, or the link is mistyped.</p>
      <Link href="/scenarios" className="mt-4 inline-block text-sm text-signal hover:underline">Back to the scenarios</Link>
    </main>
  );
}
