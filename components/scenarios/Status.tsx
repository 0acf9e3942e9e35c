/** Loading, error and empty states shared by the scenario screens. */
export function Loading({ what }: { what: string }) {
  return (
    <p role="status" aria-live="polite" className="px-4 py-6 text-sm text-ink-muted">
      Loading {what}…
    </p>
  );
}

export function LoadError({ error, retry }: { error: Error; retry?: () => void }) {
  return (
    <div role="alert" className="m-4 rounded border border-verdict-fail/30 bg-red-50 px-3 py-2 text-sm text-verdict-fail">
      Could not load: {error.message}{" "}
      {retry && (
        <button type="button" onClick={retry} className="underline">
          Try again
        </button>
      )}
    </div>
  );
}
