"use client";
/**
 * What a team with no scenarios yet can start from: one click creates a scenario from each template, or a copy of a
 * demo design (saved to the team and opened). Viewers see the same list as local drafts they can try out.
 */
import { useRouter } from "next/navigation";
import { useState } from "react";
import { TEMPLATES, defaultScenario } from "@/lib/design/templates";
import { demoScenarios } from "@/lib/design/demos";
import type { Scenario } from "@/lib/design/schema";
import { BUTTON } from "@/components/shell/classes";

export function StartingPoints({ canCreate }: { canCreate: boolean }) {
  const router = useRouter();
  const [busy, setBusy] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const demos = demoScenarios();

  async function create(key: string, title: string, template: string, body: Scenario) {
    setBusy(key);
    setError(null);
    try {
      const r = await fetch("/api/scenarios", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ title, template, body }) });
      const j = (await r.json().catch(() => ({}))) as { id?: string; message?: string };
      if (r.status === 201 && j.id) {
        router.push(`/scenarios/${j.id}`);
        return;
      }
      setError(j.message ?? "The scenario could not be created. Try again in a moment.");
    } catch {
      setError("The server could not be reached. Try again in a moment.");
    } finally {
      setBusy(null);
    }
  }

  return (
    <section aria-labelledby="start-title" className="mt-6 rounded border border-hairline bg-white p-4" data-testid="starting-points">
      <h2 id="start-title" className="text-lg font-semibold">Start your first scenario</h2>
      <p className="mt-1 text-sm text-ink-muted">
        Pick a template and set the load and supply first, then the part values: the step response and checks follow every edit.
        <br />
        Or open a copy of a demo design to see a loop that misbehaves and the checks that catch it.
      </p>
      {!canCreate && <p className="mt-2 text-sm text-ink-muted">Viewers cannot save scenarios to the team; ask a lead for the designer role, or open a local draft from New scenario.</p>}
      {canCreate && (
        <div className="mt-4 grid gap-4 md:grid-cols-2">
          <div>
            <h3 className="text-sm font-semibold">From a template</h3>
            <ul className="mt-2 space-y-2">
              {TEMPLATES.map((t) => (
                <li key={t.id}>
                  <button type="button" className={`${BUTTON} w-full text-left`} disabled={busy !== null} onClick={() => create(t.id, t.title, t.id, defaultScenario(t.id))} data-testid={`start-template-${t.id}`}>
                    {busy === t.id ? "Creating…" : t.title}
                  </button>
                </li>
              ))}
            </ul>
          </div>
          <div>
            <h3 className="text-sm font-semibold">A copy of a demo design</h3>
            <ul className="mt-2 space-y-2">
              {demos.map((d) => (
                <li key={d.key}>
                  <button type="button" className={`${BUTTON} w-full text-left`} disabled={busy !== null} onClick={() => create(d.key, d.title, d.template, d.body)} data-testid={`start-demo-${d.key}`}>
                    {busy === d.key ? "Creating…" : d.title}
                    <span className="block text-xs text-ink-muted">{d.note}</span>
                  </button>
                </li>
              ))}
            </ul>
          </div>
        </div>
      )}
      {error && <p role="alert" className="mt-3 text-sm text-verdict-fail">{error}</p>}
    </section>
  );
}
