"use client";
/**
 * Start a scenario from a template: saved to the team (POST /api/scenarios) when signed in as a designer or lead,
 * or opened as a local draft that lives only in this tab.
 */
import { useRouter } from "next/navigation";
import { useState } from "react";
import { TEMPLATES, defaultScenario, type TemplateId } from "@/lib/design/templates";
import type { Scenario } from "@/lib/design/schema";
import { Workbench } from "./Workbench";

/** A server's "field: message" answer in plain words (the field name dropped, first letter capitalised). */
function plainMessage(m: string): string {
  const t = m.replace(/^[a-zA-Z.]+:\s*/, "");
  return t.charAt(0).toUpperCase() + t.slice(1);
}

export function NewScenario({ canCreate = true }: { canCreate?: boolean }) {
  const router = useRouter();
  const [template, setTemplate] = useState<TemplateId>("sink-npn");
  const [title, setTitle] = useState(() => TEMPLATES.find((t) => t.id === "sink-npn")!.title);
  const [titleError, setTitleError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [draft, setDraft] = useState<{ scenario: Scenario; title: string } | null>(null);

  if (draft) {
    return <Workbench scenario={draft.scenario} title={draft.title} scenarioId={null} revisionId={null} revisionNumber={null} save={null} />;
  }

  const templateTitle = (id: TemplateId) => TEMPLATES.find((t) => t.id === id)!.title;
  const name = title.trim();
  /** Choosing another template renames an untouched title after it. */
  const pick = (id: TemplateId) => {
    if (title.trim() === "" || TEMPLATES.some((t) => t.title === title.trim())) setTitle(templateTitle(id));
    setTemplate(id);
  };
  const titleProblem = name === "" ? "Give the scenario a title." : name.length > 200 ? "A title has at most 200 characters." : null;

  const create = async () => {
    if (titleProblem) {
      setTitleError(titleProblem);
      document.getElementById("new-title")?.focus();
      return;
    }
    setBusy(true);
    setError(null);
    try {
      const r = await fetch("/api/scenarios", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ title: name, template, body: defaultScenario(template) }),
      });
      const j = (await r.json().catch(() => ({}))) as { id?: string; error?: string; message?: string };
      if (r.status === 201 && j.id) {
        router.push(`/scenarios/${j.id}`);
        return;
      }
      setError(
        r.status === 401 ? "Sign in as a designer or lead to save a scenario to your team, or open it as a local draft."
          : r.status === 403 ? "Your role cannot create scenarios: open it as a local draft instead."
            : plainMessage(j.message ?? j.error ?? `The server could not create the scenario (it answered ${r.status}).`),
      );
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  };

  return (
    <main className="mx-auto max-w-4xl px-6 py-8">
      <h1 className="text-2xl font-semibold">New scenario</h1>
      <p className="mt-1 text-sm text-ink-muted">Pick a template; every value can be changed in the workbench.</p>
      <fieldset className="mt-6 grid gap-3 sm:grid-cols-2">
        <legend className="sr-only">Template</legend>
        {TEMPLATES.map((t) => (
          <label
            key={t.id}
            className={`cursor-pointer rounded border bg-white p-3 ${template === t.id ? "border-signal ring-1 ring-signal" : "border-hairline"}`}
            data-testid={`template-${t.id}`}
          >
            <span className="flex items-center gap-2">
              <input type="radio" name="template" value={t.id} checked={template === t.id} onChange={() => pick(t.id)} className="accent-signal" />
              <span className="font-semibold">{t.title}</span>
            </span>
            <span className="mt-1 block text-[13px] text-ink-muted">{t.description}</span>
          </label>
        ))}
      </fieldset>
      <div className="mt-6 flex flex-wrap items-end gap-3">
        <div className="flex min-w-0 flex-col text-sm">
          <label htmlFor="new-title" className="font-medium">Title</label>
          <input id="new-title" value={title} required aria-invalid={titleError ? true : undefined} aria-describedby={titleError ? "new-title-error" : undefined}
            onChange={(e) => { setTitle(e.target.value); if (titleError) setTitleError(null); }}
            onBlur={() => { if (titleProblem) setTitleError(titleProblem); }}
            maxLength={200} className="mt-1 w-80 max-w-full rounded border border-hairline bg-white px-2 py-1.5 aria-[invalid=true]:border-verdict-fail" data-testid="new-title" />
          {titleError && <p id="new-title-error" className="mt-1 text-[13px] text-verdict-fail" data-testid="new-title-error">{titleError}</p>}
        </div>
        {canCreate ? (
          <button type="button" onClick={create} disabled={busy} className="rounded bg-signal px-4 py-2 text-sm font-semibold text-white hover:bg-signal-dark disabled:opacity-50" data-testid="new-create">
            {busy ? "Creating…" : "Create and open"}
          </button>
        ) : (
          <span className="flex flex-col">
            <button type="button" disabled aria-describedby="new-create-reason" className="rounded bg-signal px-4 py-2 text-sm font-semibold text-white opacity-50" data-testid="new-create">
              Create and open
            </button>
          </span>
        )}
        <button type="button" onClick={() => setDraft({ scenario: defaultScenario(template), title: name || templateTitle(template) })} className="rounded border border-hairline bg-white px-4 py-2 text-sm hover:bg-paper" data-testid="new-draft">
          Open as a local draft
        </button>
      </div>
      {!canCreate && (
        <p id="new-create-reason" className="mt-3 text-sm text-ink-muted" data-testid="new-create-reason">
          Viewers cannot save scenarios to the team. Open one as a local draft to try values out; ask a lead for the designer role to save.
        </p>
      )}
      {error && <p role="alert" className="mt-3 text-sm text-verdict-fail">{error}</p>}
    </main>
  );
}
