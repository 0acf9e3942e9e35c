/** A library entry's status as a word on a quiet colour. */
const STYLE: Record<string, string> = {
  draft: "border-hairline text-ink-muted bg-paper",
  submitted: "border-verdict-warn/30 text-verdict-warn bg-verdict-warn/10",
  validated: "border-verdict-pass/30 text-verdict-pass bg-verdict-pass/10",
  retired: "border-hairline text-ink-muted bg-white line-through",
};

export function StatusBadge({ status, testId }: { status: string; testId?: string }) {
  return (
    <span data-testid={testId} className={`inline-block rounded border px-1.5 py-0.5 text-[11px] font-semibold uppercase tracking-wide ${STYLE[status] ?? STYLE.draft}`}>
      {status}
    </span>
  );
}
