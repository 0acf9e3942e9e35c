/**
 * What a route shows while its server component reads the database: the page's name in words and a few quiet
 * hairline rows where the content will be (no spinner). Used by the `loading.tsx` files under app/.
 */
export function PageLoading({ label, rows = 4 }: { label: string; rows?: number }) {
  return (
    <main className="mx-auto max-w-5xl px-6 py-8" aria-busy="true" aria-live="polite">
      <p className="text-sm text-ink-muted">{label}</p>
      <div className="mt-4 rounded border border-hairline bg-white" aria-hidden>
        {Array.from({ length: rows }, (_, i) => (
          <div key={i} className="flex items-center gap-4 border-b border-hairline px-4 py-3 last:border-b-0">
            <span className="h-3 w-1/3 rounded bg-paper" />
            <span className="h-3 w-1/5 rounded bg-paper" />
            <span className="ml-auto h-3 w-16 rounded bg-paper" />
          </div>
        ))}
      </div>
    </main>
  );
}
