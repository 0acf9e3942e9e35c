import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { jar } from "./support/next-headers";

// Server actions read the session through next/headers: the cookie jar holds the sealed cookie of the actor under
// test, as in the authorization matrix.
vi.mock("server-only", () => ({}));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
vi.mock("next/headers", async () => (await import("./support/next-headers")).nextHeaders);

import knexFactory, { type Knex } from "knex";
import { NextRequest } from "next/server";
import { db } from "@/lib/db/knex";
import * as scenarios from "@/app/api/scenarios/route";
import * as scenario from "@/app/api/scenarios/[id]/route";
import * as comments from "@/app/api/scenarios/[id]/comments/route";
import * as members from "@/app/api/team/members/route";
import * as scenarioTraces from "@/app/api/scenarios/[id]/traces/route";
import * as library from "@/app/api/library/route";
import * as libraryEntry from "@/app/api/library/[id]/route";
import { saveScenarioRevision, forkScenario, commentOnScenario, setScenarioDeleted } from "@/app/scenarios/[id]/actions";
import { signInAction, signOutAction, signOutEverywhereAction, signUpAction, createTeamAction } from "@/app/(account)/actions";
import { startFromEntryAction } from "@/app/library/actions";
import { changeEntryStatus, submitForValidation } from "@/lib/library/workflow";
import { createScenario } from "@/lib/scenarios/save";
import { createPublicLink, openPublicLink } from "@/lib/db/shareLinks";
import { changeRole, removeMember } from "@/lib/db/teams";
import { DomainError } from "@/lib/errors";
import { DATABASE_UNAVAILABLE } from "@/lib/db/outage";
import { proxy } from "@/proxy";
import { closeDb, cookieFor, ctx, FIXTURE_PASSWORD, makeFixture, ORIGIN, request, type Actor, type Fixture } from "./support/fixtures";

let f: Fixture;
beforeAll(async () => {
  f = await makeFixture("harden");
});
afterAll(closeDb);

const NUL = "\u0000";

/** Runs a server action as `a` (cookie in the jar); a redirect (Next throws it) comes back as "redirect". */
async function asActor<T>(a: Actor | null, fn: () => Promise<T>): Promise<T | "redirect"> {
  jar.cookie = await cookieFor(a);
  try {
    return await fn();
  } catch (e) {
    if (e instanceof Error && /NEXT_REDIRECT/.test(String((e as { digest?: string }).digest ?? e.message))) return "redirect";
    throw e;
  }
}

function form(fields: Record<string, string>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields)) fd.set(k, v);
  return fd;
}

async function members200(cookie: string | undefined): Promise<number> {
  const req = new Request(`${ORIGIN}/api/team/members`, { headers: { host: "127.0.0.1:3999", ...(cookie ? { cookie } : {}) } });
  return (await members.GET(req, ctx({}))).status;
}

// ── 1. Sessions end on the server ──────────────────────────────────────────────────────────────────────────────

describe("sign-out ends the session on the server", () => {
  it("a copy of the cookie taken before sign-out no longer reads or writes", async () => {
    const cookie = await cookieFor(f.designer);
    expect(await members200(cookie)).toBe(200);
    jar.cookie = cookie;
    await expect(signOutAction()).rejects.toThrow(/NEXT_REDIRECT/);
    expect(await members200(cookie)).toBe(401);
    const post = new Request(`${ORIGIN}/api/scenarios`, {
      method: "POST",
      headers: { host: "127.0.0.1:3999", cookie: cookie!, "content-type": "application/json" },
      body: JSON.stringify({ title: "After sign-out", template: "sink-npn" }),
    });
    expect((await scenarios.POST(post, ctx({}))).status).toBe(401);
  });

  it("sign out everywhere ends every session of that user, and only theirs", async () => {
    const laptop = await cookieFor(f.viewer);
    const phone = await cookieFor(f.viewer);
    const someoneElse = await cookieFor(f.lead);
    expect([await members200(laptop), await members200(phone)]).toEqual([200, 200]);
    jar.cookie = laptop;
    await expect(signOutEverywhereAction()).rejects.toThrow(/NEXT_REDIRECT/);
    expect([await members200(laptop), await members200(phone), await members200(someoneElse)]).toEqual([401, 401, 200]);
  });

  it("signing in starts a session row that the cookie names; signing out deletes it", async () => {
    jar.cookie = undefined;
    const before = Number((await db()("sessions").where({ user_id: f.lead.id }).count<{ n: string }[]>({ n: "*" }))[0]!.n);
    await expect(signInAction({}, form({ email: f.lead.email, password: FIXTURE_PASSWORD, next: "/scenarios" }))).rejects.toThrow(/NEXT_REDIRECT/);
    const after = Number((await db()("sessions").where({ user_id: f.lead.id }).count<{ n: string }[]>({ n: "*" }))[0]!.n);
    expect(after).toBe(before + 1);
  });
});

// ── 3. Control characters in stored text ───────────────────────────────────────────────────────────────────────

describe("NUL and other control characters in stored text: 400 naming the field", () => {
  async function fieldsOf(r: Response): Promise<string[]> {
    expect(r.status).toBe(400);
    return Object.keys(((await r.json()) as { fieldErrors?: object }).fieldErrors ?? {});
  }

  it("route handlers: scenario title and note, comment, library comment and note", async () => {
    expect(await fieldsOf(await scenarios.POST(await request("POST", "/api/scenarios", f.designer, { title: `Sink${NUL}`, template: "sink-npn" }), ctx({})))).toEqual(["title"]);
    expect(await fieldsOf(await scenarios.POST(await request("POST", "/api/scenarios", f.designer, { title: "Sink", template: "sink-npn", note: `a\u0007b` }), ctx({})))).toEqual(["note"]);
    const id = f.scenarioId;
    expect(await fieldsOf(await scenario.PATCH(await request("PATCH", `/api/scenarios/${id}`, f.designer, { title: `T${NUL}` }), ctx({ id })))).toEqual(["title"]);
    expect(await fieldsOf(await comments.POST(await request("POST", `/api/scenarios/${id}/comments`, f.viewer, { body: `ok${NUL}` }), ctx({ id })))).toEqual(["body"]);
    // Tab and newlines stay allowed.
    expect((await comments.POST(await request("POST", `/api/scenarios/${id}/comments`, f.viewer, { body: "line one\r\n\tline two" }), ctx({ id }))).status).toBe(201);

    const { entryId, traceId, scenarioId } = await submittedEntry();
    expect(await fieldsOf(await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, f.lead, { comment: `fine${NUL}` }), ctx({ id: entryId })))).toEqual(["comment"]);
    expect(await fieldsOf(await library.POST(await request("POST", "/api/library", f.designer, { scenarioId, note: `n${NUL}`, traceIds: [traceId] }), ctx({})))).toEqual(["note"]);
  });

  it("trace upload: label, file name and settings", async () => {
    const label = await uploadTrace(f.designer, f.scenarioId, { label: `scope${NUL}` });
    expect(await fieldsOf(label)).toEqual(["label"]);
    const file = await uploadTrace(f.designer, f.scenarioId, { fileName: `cap${NUL}.csv` });
    expect(await fieldsOf(file)).toEqual(["file"]);
    const settings = await uploadTrace(f.designer, f.scenarioId, { settings: JSON.stringify({ probe: `10x${NUL}` }) });
    expect(await fieldsOf(settings)).toEqual(["settings"]);
    expect(await fieldsOf(await uploadTrace(f.designer, f.scenarioId, { settings: JSON.stringify({ [`k${NUL}`]: 1 }) }))).toEqual(["settings"]);
    // A column name in the CSV header is stored too.
    expect(await fieldsOf(await uploadTrace(f.designer, f.scenarioId, { header: `Time (ms),I${NUL} (mA)` }))).toEqual(["file"]);
  });

  it("server actions: save note, fork title, comment, library start title, sign-up name and team name, new team name", async () => {
    const save = await asActor(f.designer, () => saveScenarioRevision({ scenarioId: f.scenarioId, baseRevisionId: f.revisionId, note: `n${NUL}`, body: {} }));
    expect(save).toMatchObject({ ok: false, message: expect.stringMatching(/^note: control characters/) });
    const fork = await asActor(f.designer, () => forkScenario({ revisionId: f.revisionId, title: `fork${NUL}` }));
    expect(fork).toMatchObject({ ok: false, message: expect.stringMatching(/^title: control characters/) });
    const comment = await asActor(f.viewer, () => commentOnScenario({ scenarioId: f.scenarioId, body: `hi${NUL}` }));
    expect(comment).toMatchObject({ ok: false, message: expect.stringMatching(/^comment: control characters/) });

    const { entryId } = await submittedEntry();
    await changeEntryStatus(f.lead, entryId, "validate");
    const start = await asActor(f.designer, () => startFromEntryAction({}, form({ entryId, title: `copy${NUL}` })));
    expect(start !== "redirect" && Object.keys(start.fieldErrors ?? {})).toEqual(["title"]);

    jar.cookie = undefined;
    const signUp = await signUpAction({}, form({ name: `Ann${NUL}`, email: `nul.${f.tag}@fixture.test`, password: "long-enough-pass", teamName: `Bench${NUL}` }));
    expect(Object.keys(signUp.fieldErrors ?? {}).sort()).toEqual(["name", "teamName"]);
    const team = await asActor(f.viewer, () => createTeamAction({}, form({ teamName: `Second${NUL}` })));
    expect(team !== "redirect" && Object.keys(team.fieldErrors ?? {})).toEqual(["teamName"]);
  });
});

// ── 5. Database outage ─────────────────────────────────────────────────────────────────────────────────────────

describe("database outage: 503 'the database is unavailable, try again' with Retry-After", () => {
  const g = globalThis as { quellKnex?: Knex };
  let real: Knex | undefined;
  let dead: Knex | undefined;
  let designerCookie: string | undefined;
  let viewerCookie: string | undefined;

  beforeAll(async () => {
    designerCookie = await cookieFor(f.designer);
    viewerCookie = await cookieFor(f.viewer);
    real = g.quellKnex;
    // Nothing listens on port 1: every connection is refused, as when PostgreSQL is stopped.
    dead = knexFactory({ client: "pg", connection: "postgres://quell:x@127.0.0.1:1/none", pool: { min: 0, max: 2 }, acquireConnectionTimeout: 5000 });
    g.quellKnex = dead;
  });
  afterAll(async () => {
    g.quellKnex = real;
    await dead?.destroy();
  });

  it("route handlers answer 503 with Retry-After and the message", async () => {
    const headers = (cookie?: string) => ({ host: "127.0.0.1:3999", ...(cookie ? { cookie } : {}) });
    const responses = [
      await scenarios.GET(new Request(`${ORIGIN}/api/scenarios`, { headers: headers(viewerCookie) }), ctx({})),
      await members.GET(new Request(`${ORIGIN}/api/team/members`, { headers: headers(viewerCookie) }), ctx({})),
      await scenarios.POST(new Request(`${ORIGIN}/api/scenarios`, { method: "POST", headers: { ...headers(designerCookie), "content-type": "application/json" }, body: JSON.stringify({ title: "x", template: "sink-npn" }) }), ctx({})),
    ];
    for (const r of responses) {
      expect(r.status).toBe(503);
      expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(0);
      expect(((await r.json()) as { error: string }).error).toBe(DATABASE_UNAVAILABLE);
    }
  });

  it("pages and server actions (through the proxy) answer 503 with Retry-After", async () => {
    for (const [method, path] of [["GET", "/scenarios"], ["GET", "/sign-in"], ["POST", "/sign-in"]] as const) {
      const r = await proxy(new NextRequest(`${ORIGIN}${path}`, { method, headers: { host: "127.0.0.1:3999", origin: ORIGIN } }));
      expect(r.status).toBe(503);
      expect(Number(r.headers.get("retry-after"))).toBeGreaterThan(0);
      expect(await r.text()).toContain(DATABASE_UNAVAILABLE);
    }
  });

  it("the save action says so and offers a retry; sign-in says so and keeps the address typed", async () => {
    jar.cookie = designerCookie;
    const save = await saveScenarioRevision({ scenarioId: f.scenarioId, baseRevisionId: f.revisionId, note: "during outage", body: {} });
    expect(save).toEqual({ ok: false, message: DATABASE_UNAVAILABLE, retry: true });
    jar.cookie = undefined;
    const signIn = await signInAction({}, form({ email: f.viewer.email, password: FIXTURE_PASSWORD }));
    expect(signIn).toMatchObject({ message: DATABASE_UNAVAILABLE, values: { email: f.viewer.email } });
  });
});

// ── 7. Revocation by deletion is permanent ─────────────────────────────────────────────────────────────────────

describe("public links of a deleted scenario stay revoked after it is restored", () => {
  it("delete → revoked; restore → still revoked", async () => {
    const s = await createScenario(f.designer, { title: "Shared then deleted", template: "sink-npn" });
    const { token } = await createPublicLink(f.designer, s.id, { days: 7 });
    expect((await openPublicLink(token)).state).toBe("active");
    expect(await asActor(f.designer, () => setScenarioDeleted({ scenarioId: s.id, deleted: true }))).toEqual({ ok: true });
    expect((await openPublicLink(token)).state).toBe("revoked");
    expect(await asActor(f.designer, () => setScenarioDeleted({ scenarioId: s.id, deleted: false }))).toEqual({ ok: true });
    expect((await openPublicLink(token)).state).toBe("revoked");
    // A link made after the restore works.
    const fresh = await createPublicLink(f.designer, s.id, { days: 7 });
    expect((await openPublicLink(fresh.token)).state).toBe("active");
  });

  it("the same through the API's DELETE and PATCH { restore }", async () => {
    const s = await createScenario(f.designer, { title: "Shared then deleted (API)", template: "sink-npn" });
    const { token } = await createPublicLink(f.designer, s.id, { days: 7 });
    expect((await scenario.DELETE(await request("DELETE", `/api/scenarios/${s.id}`, f.designer), ctx({ id: s.id }))).status).toBe(204);
    expect((await scenario.PATCH(await request("PATCH", `/api/scenarios/${s.id}`, f.designer, { restore: true }), ctx({ id: s.id }))).status).toBe(200);
    expect((await openPublicLink(token)).state).toBe("revoked");
  });
});

// ── 8. The last lead ───────────────────────────────────────────────────────────────────────────────────────────

describe("the last lead cannot demote or remove themselves", () => {
  it("refused on the server with a clear message (409), the team keeps its lead", async () => {
    const h = await makeFixture("lastlead-self");
    for (const attempt of [() => changeRole(h.lead, h.lead.id, "designer"), () => removeMember(h.lead, h.lead.id)]) {
      const e = await attempt().then(() => null, (x: unknown) => x);
      expect(e).toBeInstanceOf(DomainError);
      expect((e as DomainError).status).toBe(409);
      expect((e as DomainError).message).toMatch(/at least one lead/);
    }
    const patch = await members.PATCH(await request("PATCH", "/api/team/members", h.lead, { userId: h.lead.id, role: "viewer" }), ctx({}));
    expect(patch.status).toBe(409);
    expect(((await patch.json()) as { error: string }).error).toMatch(/at least one lead/);
    const del = await members.DELETE(await request("DELETE", `/api/team/members?userId=${h.lead.id}`, h.lead), ctx({}));
    expect(del.status).toBe(409);
    expect(await db()("memberships").where({ team_id: h.lead.teamId, user_id: h.lead.id }).first("role")).toEqual({ role: "lead" });
  });
});

// ── helpers ────────────────────────────────────────────────────────────────────────────────────────────────────

async function uploadTrace(a: Actor, scenarioId: string, o: { label?: string; fileName?: string; settings?: string; header?: string } = {}): Promise<Response> {
  const lines = [o.header ?? "Time (ms),I (mA)"];
  for (let k = 0; k < 40; k++) lines.push(`${(k * 0.1).toFixed(1)},${k < 10 ? 0 : 500}`);
  const fd = new FormData();
  fd.set("file", new File([lines.join("\n")], o.fileName ?? "bench.csv", { type: "text/csv" }));
  if (o.label !== undefined) fd.set("label", o.label);
  if (o.settings !== undefined) fd.set("settings", o.settings);
  const headers: Record<string, string> = { host: "127.0.0.1:3999", cookie: (await cookieFor(a))! };
  return scenarioTraces.POST(new Request(`${ORIGIN}/api/scenarios/${scenarioId}/traces`, { method: "POST", headers, body: fd }), ctx({ id: scenarioId }));
}

async function submittedEntry(): Promise<{ entryId: string; scenarioId: string; traceId: string }> {
  const s = await createScenario(f.designer, { title: "Entry target", template: "sink-npn" });
  const t = await uploadTrace(f.designer, s.id);
  const traceId = ((await t.json()) as { id: string }).id;
  // a passing comparison: validating needs no override
  const r = await submitForValidation(f.designer, s.id, { note: "bench", traceIds: [traceId], keyFigures: {}, comparisons: [{ traceId, channel: 0, offset: 0, verdict: "pass", rows: [] }] });
  return { entryId: r.entryId, scenarioId: s.id, traceId };
}
