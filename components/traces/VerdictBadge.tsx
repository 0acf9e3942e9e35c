/** A verdict word on its colour: pass, warn or fail (never colour alone). */
export type VerdictWord = "pass" | "warn" | "fail";

const STYLE: Record<VerdictWord, string> = {
  pass: "text-verdict-pass bg-verdict-pass/10 border-verdict-pass/30",
  warn: "text-verdict-warn bg-verdict-warn/10 border-verdict-warn/30",
  fail: "text-verdict-fail bg-verdict-fail/10 border-verdict-fail/30",
};

export function VerdictBadge({ verdict, testId }: { verdict: VerdictWord | null | undefined; testId?: string }) {
  if (!verdict) return <span className="text-xs text-ink-muted">—</span>;
  return (
    <span data-testid={testId} className={`inline-block rounded border px-1.5 py-0.5 text-[11px] font-semibold uppercase tracking-wide ${STYLE[verdict]}`}>
      {verdict}
    </span>
  );
}
