"use client";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useEffect, useMemo, useState } from "react";
import useSWR from "swr";
import { ago, fetcher, send, FetchError } from "./fetcher";
import { Loading, LoadError } from "./Status";
import { BUTTON_PRIMARY } from "@/components/shell/classes";
import { formatDateTime } from "@/lib/shared/dates";
import { StartingPoints } from "./StartingPoints";

interface Row {
  id: string;
  title: string;
  template: string;
  status: string;
  ownerId: string;
  ownerName: string;
  revisionNumber: number | null;
  updatedAt: string;
  deletedAt: string | null;
}
interface ListResponse {
  items: Row[];
  total: number;
  page: number;
  pageSize: number;
  facets: { owners: { id: string; name: string }[]; templates: string[]; statuses: string[] };
}

type Sort = "title" | "updated" | "template" | "status" | "owner";
const COLUMNS: { key: Sort; label: string }[] = [
  { key: "title", label: "Scenario" },
  { key: "template", label: "Template" },
  { key: "owner", label: "Owner" },
  { key: "status", label: "Status" },
  { key: "updated", label: "Updated" },
];

/** The team's scenarios: search, filters, sortable columns, pages; soft-deleted ones in their own view. */
export function ScenarioTable({ me, canCreate, templates }: { me: { id: string; role: string }; canCreate: boolean; templates: { id: string; title: string }[] }) {
  const router = useRouter();
  const [q, setQ] = useState("");
  const [owner, setOwner] = useState("");
  const [template, setTemplate] = useState("");
  const [status, setStatus] = useState("");
  const [sort, setSort] = useState<Sort>("updated");
  const [dir, setDir] = useState<"asc" | "desc">("desc");
  const [page, setPage] = useState(1);
  const [deleted, setDeleted] = useState(false);
  const [actionError, setActionError] = useState<string | null>(null);
  // The search box asks the server a beat after typing stops, not on every key.
  const [query, setQuery] = useState("");
  useEffect(() => {
    const t = setTimeout(() => setQuery(q.trim()), 250);
    return () => clearTimeout(t);
  }, [q]);

  const url = useMemo(() => {
    const p = new URLSearchParams({ sort, dir, page: String(page), pageSize: "20" });
    if (query) p.set("q", query);
    if (owner) p.set("owner", owner);
    if (template) p.set("template", template);
    if (status) p.set("status", status);
    if (deleted) p.set("deleted", "1");
    return `/api/scenarios?${p}`;
  }, [query, owner, template, status, sort, dir, page, deleted]);
  const { data, error, isLoading, mutate } = useSWR<ListResponse, FetchError>(url, fetcher, { keepPreviousData: true });
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  const templateTitle = (id: string) => templates.find((t) => t.id === id)?.title ?? id;

  function sortBy(k: Sort) {
    if (k === sort) setDir(dir === "asc" ? "desc" : "asc");
    else {
      setSort(k);
      setDir(k === "updated" ? "desc" : "asc");
    }
    setPage(1);
  }

  async function restore(id: string) {
    setActionError(null);
    try {
      await send(`/api/scenarios/${id}`, "PATCH", { restore: true });
      await mutate();
    } catch (e) {
      setActionError((e as Error).message);
    }
  }

  const selectCls = "rounded border border-hairline bg-white px-2 py-1.5 text-sm";
  return (
    <section aria-labelledby="scenario-table-title" className="mt-6">
      <h2 id="scenario-table-title" className="sr-only">
        Scenario table
      </h2>
      <div className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor="sc-q" className="text-xs font-medium text-ink-muted">Search titles</label>
          <input id="sc-q" type="search" value={q} onChange={(e) => { setQ(e.target.value); setPage(1); }} className={`${selectCls} w-56`} placeholder="e.g. coil" />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="sc-owner" className="text-xs font-medium text-ink-muted">Owner</label>
          <select id="sc-owner" value={owner} onChange={(e) => { setOwner(e.target.value); setPage(1); }} className={selectCls}>
            <option value="">Anyone</option>
            <option value="me">Me</option>
            {data?.facets.owners.filter((o) => o.id !== me.id).map((o) => <option key={o.id} value={o.id}>{o.name}</option>)}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="sc-template" className="text-xs font-medium text-ink-muted">Template</label>
          <select id="sc-template" value={template} onChange={(e) => { setTemplate(e.target.value); setPage(1); }} className={selectCls}>
            <option value="">Any</option>
            {(data?.facets.templates ?? []).map((t) => <option key={t} value={t}>{templateTitle(t)}</option>)}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="sc-status" className="text-xs font-medium text-ink-muted">Status</label>
          <select id="sc-status" value={status} onChange={(e) => { setStatus(e.target.value); setPage(1); }} className={selectCls}>
            <option value="">Any</option>
            {(data?.facets.statuses ?? []).map((s) => <option key={s} value={s}>{s}</option>)}
          </select>
        </div>
        <label className="flex items-center gap-2 pb-1.5 text-sm text-ink-muted">
          <input type="checkbox" checked={deleted} onChange={(e) => { setDeleted(e.target.checked); setPage(1); }} />
          Deleted
        </label>
      </div>

      {actionError && <p role="alert" className="mt-3 text-sm text-verdict-fail">Not done: {actionError}</p>}
      {data && data.total === 0 && !deleted && !query && !owner && !template && !status && <StartingPoints canCreate={canCreate} />}

      <div className="mt-4 overflow-x-auto rounded border border-hairline bg-white">
        {error && !data ? (
          <LoadError error={error} retry={() => mutate()} />
        ) : isLoading && !data ? (
          <Loading what="scenarios" />
        ) : (
          <table className="w-full text-left text-sm" aria-busy={isLoading}>
            <thead className="border-b border-hairline text-xs tracking-wide text-ink-muted">
              <tr>
                {COLUMNS.map((c) => (
                  <th key={c.key} scope="col" className="px-4 py-2 font-medium" aria-sort={sort === c.key ? (dir === "asc" ? "ascending" : "descending") : "none"}>
                    <button type="button" onClick={() => sortBy(c.key)} className="hover:text-ink">
                      {c.label} {sort === c.key ? (dir === "asc" ? "▲" : "▼") : ""}
                    </button>
                  </th>
                ))}
                <th scope="col" className="px-4 py-2 font-medium">Revision</th>
                {deleted && <th scope="col" className="px-4 py-2"><span className="sr-only">Actions</span></th>}
              </tr>
            </thead>
            <tbody className="divide-y divide-hairline">
              {data?.items.length === 0 && (
                <tr>
                  <td colSpan={7} className="px-4 py-6 text-ink-muted">{deleted ? "No deleted scenarios." : query || owner || template || status ? "No scenarios match." : "No scenarios yet: start from one of the starting points above."}</td>
                </tr>
              )}
              {data?.items.map((r) => (
                <tr key={r.id} className="hover:bg-paper">
                  <td className="px-4 py-2">
                    {deleted ? (
                      <span className="font-medium">{r.title}</span>
                    ) : (
                      <Link href={`/scenarios/${r.id}`} className="font-medium text-signal hover:underline">{r.title}</Link>
                    )}
                  </td>
                  <td className="px-4 py-2 text-ink-muted">{templateTitle(r.template)}</td>
                  <td className="px-4 py-2">{r.ownerName}</td>
                  <td className="px-4 py-2">{r.status}</td>
                  <td className="px-4 py-2 text-ink-muted" title={formatDateTime(r.updatedAt)}>{ago(r.updatedAt)}</td>
                  <td className="num px-4 py-2">
                    {r.revisionNumber !== null && !deleted ? (
                      <Link href={`/scenarios/${r.id}/history`} className="text-signal hover:underline" aria-label={`History of ${r.title}`}>r{r.revisionNumber}</Link>
                    ) : (
                      r.revisionNumber
                    )}
                  </td>
                  {deleted && (
                    <td className="px-4 py-2 text-right">
                      {(me.role === "lead" || r.ownerId === me.id) && (
                        <button type="button" onClick={() => restore(r.id)} className="rounded border border-hairline px-2 py-1 text-xs hover:border-signal">
                          Restore
                        </button>
                      )}
                    </td>
                  )}
                </tr>
              ))}
            </tbody>
          </table>
        )}
      </div>
      <nav aria-label="Pages" className="mt-3 flex items-center gap-3 text-sm">
        <button type="button" disabled={page <= 1} onClick={() => setPage(page - 1)} className="rounded border border-hairline px-2 py-1 disabled:opacity-40">Previous</button>
        <span className="text-ink-muted">
          Page {page} of {pages}
          {data ? ` · ${data.total} scenario${data.total === 1 ? "" : "s"}` : ""}
        </span>
        <button type="button" disabled={page >= pages} onClick={() => setPage(page + 1)} className="rounded border border-hairline px-2 py-1 disabled:opacity-40">Next</button>
      </nav>
      {canCreate && <NewScenario templates={templates} onCreated={(id) => router.push(`/scenarios/${id}`)} />}
    </section>
  );
}

function NewScenario({ templates, onCreated }: { templates: { id: string; title: string }[]; onCreated: (id: string) => void }) {
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  async function submit(e: React.FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const fd = new FormData(e.currentTarget);
    setBusy(true);
    setErrors({});
    setMessage(null);
    try {
      const r = await send<{ id: string }>("/api/scenarios", "POST", { title: String(fd.get("title") ?? ""), template: String(fd.get("template") ?? "") });
      onCreated(r.id);
    } catch (err) {
      const data = err instanceof FetchError ? (err.data as { fieldErrors?: Record<string, string[]> }) : undefined;
      setErrors(data?.fieldErrors ?? {});
      setMessage((err as Error).message);
    } finally {
      setBusy(false);
    }
  }
  return (
    <form onSubmit={submit} className="mt-8 flex flex-wrap items-end gap-3 rounded border border-hairline bg-white p-4" noValidate aria-labelledby="new-scenario-title">
      <h2 id="new-scenario-title" className="w-full text-base font-semibold">
        New scenario{" "}
        <Link href="/scenarios/new" className="ml-2 text-sm font-normal text-signal underline">or pick a template in the workbench</Link>
      </h2>
      <div className="flex flex-col gap-1">
        <label htmlFor="new-title" className="text-xs font-medium text-ink-muted">Title</label>
        <input id="new-title" name="title" required maxLength={200} aria-invalid={errors.title ? true : undefined} aria-describedby={errors.title ? "new-title-err" : undefined} className="w-72 rounded border border-hairline px-2 py-1.5 text-sm aria-[invalid=true]:border-verdict-fail" />
        {errors.title && <p id="new-title-err" className="text-xs text-verdict-fail">{errors.title.join(" ")}</p>}
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor="new-template" className="text-xs font-medium text-ink-muted">Template</label>
        <select id="new-template" name="template" className="rounded border border-hairline bg-white px-2 py-1.5 text-sm">
          {templates.map((t) => <option key={t.id} value={t.id}>{t.title}</option>)}
        </select>
      </div>
      <button type="submit" disabled={busy} className={BUTTON_PRIMARY}>
        {busy ? "Creating…" : "Create"}
      </button>
      {message && !errors.title && <p role="alert" className="w-full text-sm text-verdict-fail">Not done: {message}</p>}
    </form>
  );
}
