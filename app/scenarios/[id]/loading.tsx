export default function Loading() {
  return (
    <main className="px-6 py-10 text-sm text-ink-muted" aria-busy="true">
      Opening the scenario…
    </main>
  );
}
