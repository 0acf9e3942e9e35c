import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { jar } from "./support/next-headers";

// Server actions read the session through next/headers; outside Next there is no request scope, so the cookie
// jar is replaced by one holding the sealed cookie of the actor under test (the same seal the browser sends).
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
vi.mock("next/headers", async () => (await import("./support/next-headers")).nextHeaders);

import { db } from "@/lib/db/knex";
import * as scenarios from "@/app/api/scenarios/route";
import * as scenario from "@/app/api/scenarios/[id]/route";
import * as revisions from "@/app/api/scenarios/[id]/revisions/route";
import * as comments from "@/app/api/scenarios/[id]/comments/route";
import * as shareLinks from "@/app/api/scenarios/[id]/share-links/route";
import * as members from "@/app/api/team/members/route";
import * as invitations from "@/app/api/team/invitations/route";
import * as scenarioTraces from "@/app/api/scenarios/[id]/traces/route";
import * as traceRoute from "@/app/api/traces/[id]/route";
import * as library from "@/app/api/library/route";
import * as libraryEntry from "@/app/api/library/[id]/route";
import * as partsRoute from "@/app/api/parts/route";
import * as partRoute from "@/app/api/parts/[id]/route";
import { createPart } from "@/lib/parts/workflow";
import { opampPreset } from "@/lib/design/presets";
import { saveScenarioRevision, forkScenario, setScenarioDeleted, commentOnScenario } from "@/app/scenarios/[id]/actions";
import { startFromEntryAction, setTolerancesAction } from "@/app/library/actions";
import { changeEntryStatus, submitForValidation } from "@/lib/library/workflow";
import { createScenario } from "@/lib/scenarios/save";
import { createPublicLink } from "@/lib/db/shareLinks";
import { createInvitation } from "@/lib/db/teams";
import { closeDb, cookieFor, ctx, FIXTURE_PASSWORD, makeFixture, request, scenarioBody, type Actor, type Fixture } from "./support/fixtures";

type Who = "anonymous" | "viewer" | "designer" | "lead" | "outsider";
const WHO: Who[] = ["anonymous", "viewer", "designer", "lead", "outsider"];

let f: Fixture;
const actor = (w: Who): Actor | null => (w === "anonymous" ? null : f[w]);

beforeAll(async () => {
  f = await makeFixture("matrix");
});
afterAll(closeDb);

/** A fresh scenario owned by the designer, for the cases that change or delete one. */
async function freshScenario(): Promise<string> {
  return (await createScenario(f.designer, { title: "Matrix target", template: "sink-npn" })).id;
}

/** A team op-amp of our own (values of the built-in general preset), made by the designer. */
function opampPartInput(name: string) {
  const { preset: _p, part: _r, ...values } = opampPreset("General 1 MHz single-supply");
  return { kind: "opamp" as const, name, values };
}
async function freshPart(): Promise<string> {
  return (await createPart(f.designer, opampPartInput(`Matrix amp ${Date.now()} ${Math.random()}`))).id;
}

async function newMember(): Promise<string> {
  const [u] = await db()("users").insert({ email: `m${Date.now()}${Math.random()}@fixture.test`, name: "Temp", password_hash: "x" }).returning("id");
  await db()("memberships").insert({ team_id: f.lead.teamId, user_id: u.id, role: "viewer" });
  return u.id;
}

interface Case {
  name: string;
  expect: Record<Who, number>;
  call: (a: Actor | null) => Promise<Response>;
}

// Expected statuses come from the issue's role rules: viewers read and comment; designers create, edit, fork and
// share; owner or lead delete and publish; leads manage the team; another team's member sees 404 (not 403), so
// existence is not revealed; anonymous gets 401 whatever else is wrong with the request.
const cases: Case[] = [
  {
    name: "GET /api/scenarios",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 200 },
    call: async (a) => scenarios.GET(await request("GET", "/api/scenarios?sort=title", a), ctx({})),
  },
  {
    name: "POST /api/scenarios",
    expect: { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 201 },
    call: async (a) => scenarios.POST(await request("POST", "/api/scenarios", a, { title: "New from matrix", template: "sink-nmos" }), ctx({})),
  },
  {
    name: "GET /api/scenarios/[id]",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => scenario.GET(await request("GET", `/api/scenarios/${f.scenarioId}`, a), ctx({ id: f.scenarioId })),
  },
  {
    name: "PATCH /api/scenarios/[id] (new revision)",
    expect: { anonymous: 401, viewer: 403, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const id = await freshScenario();
      const base = (await db()("scenarios").where({ id }).first()).current_revision_id;
      return scenario.PATCH(await request("PATCH", `/api/scenarios/${id}`, a, { baseRevisionId: base, note: "matrix", body: scenarioBody({ senseResistor: 0.5 }) }), ctx({ id }));
    },
  },
  {
    name: "DELETE /api/scenarios/[id] (owned by the designer)",
    expect: { anonymous: 401, viewer: 403, designer: 204, lead: 204, outsider: 404 },
    call: async (a) => {
      const id = await freshScenario();
      return scenario.DELETE(await request("DELETE", `/api/scenarios/${id}`, a), ctx({ id }));
    },
  },
  {
    name: "GET /api/scenarios/[id]/revisions",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => revisions.GET(await request("GET", `/api/scenarios/${f.scenarioId}/revisions`, a), ctx({ id: f.scenarioId })),
  },
  {
    name: "GET /api/scenarios/[id]/comments",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => comments.GET(await request("GET", `/api/scenarios/${f.scenarioId}/comments`, a), ctx({ id: f.scenarioId })),
  },
  {
    name: "POST /api/scenarios/[id]/comments",
    expect: { anonymous: 401, viewer: 201, designer: 201, lead: 201, outsider: 404 },
    call: async (a) => comments.POST(await request("POST", `/api/scenarios/${f.scenarioId}/comments`, a, { body: "Looks stable." }), ctx({ id: f.scenarioId })),
  },
  {
    name: "GET /api/scenarios/[id]/share-links",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => shareLinks.GET(await request("GET", `/api/scenarios/${f.scenarioId}/share-links`, a), ctx({ id: f.scenarioId })),
  },
  {
    name: "POST /api/scenarios/[id]/share-links (designer owns the scenario)",
    expect: { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 404 },
    call: async (a) => shareLinks.POST(await request("POST", `/api/scenarios/${f.scenarioId}/share-links`, a, { days: 3 }), ctx({ id: f.scenarioId })),
  },
  {
    name: "DELETE /api/scenarios/[id]/share-links",
    expect: { anonymous: 401, viewer: 403, designer: 204, lead: 204, outsider: 404 },
    call: async (a) => {
      const { link } = await createPublicLink(f.designer, f.scenarioId, { days: 1 });
      return shareLinks.DELETE(await request("DELETE", `/api/scenarios/${f.scenarioId}/share-links?id=${link.id}`, a), ctx({ id: f.scenarioId }));
    },
  },
  {
    name: "GET /api/team/members",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 200 },
    call: async (a) => members.GET(await request("GET", "/api/team/members", a), ctx({})),
  },
  {
    name: "PATCH /api/team/members",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 200, outsider: 404 },
    call: async (a) => members.PATCH(await request("PATCH", "/api/team/members", a, { userId: await newMember(), role: "designer" }), ctx({})),
  },
  {
    name: "DELETE /api/team/members",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 204, outsider: 404 },
    call: async (a) => members.DELETE(await request("DELETE", `/api/team/members?userId=${await newMember()}`, a), ctx({})),
  },
  {
    name: "GET /api/team/invitations",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 200, outsider: 200 },
    call: async (a) => invitations.GET(await request("GET", "/api/team/invitations", a), ctx({})),
  },
  {
    name: "POST /api/team/invitations",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 201, outsider: 201 },
    call: async (a) => invitations.POST(await request("POST", "/api/team/invitations", a, { email: `new.${Date.now()}@fixture.test`, role: "viewer" }), ctx({})),
  },
  {
    name: "DELETE /api/team/invitations",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 204, outsider: 404 },
    call: async (a) => {
      const { invitation } = await createInvitation(f.lead, `gone.${Date.now()}@fixture.test`, "viewer");
      return invitations.DELETE(await request("DELETE", `/api/team/invitations?id=${invitation.id}`, a), ctx({}));
    },
  },
  // The team's parts: every member reads; designers and leads create, version and retire; another team's part is 404.
  {
    name: "GET /api/parts",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 200 },
    call: async (a) => partsRoute.GET(await request("GET", "/api/parts?kind=opamp", a), ctx({})),
  },
  {
    name: "POST /api/parts",
    expect: { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 201 },
    call: async (a) => partsRoute.POST(await request("POST", "/api/parts", a, opampPartInput(`Matrix new ${Date.now()} ${Math.random()}`)), ctx({})),
  },
  {
    name: "GET /api/parts/[id]",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const id = await freshPart();
      return partRoute.GET(await request("GET", `/api/parts/${id}`, a), ctx({ id }));
    },
  },
  {
    name: "PATCH /api/parts/[id] (new version)",
    expect: { anonymous: 401, viewer: 403, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const id = await freshPart();
      return partRoute.PATCH(await request("PATCH", `/api/parts/${id}`, a, { values: { ...opampPartInput("x").values, GBW: 2e6 }, note: "faster" }), ctx({ id }));
    },
  },
  {
    name: "DELETE /api/parts/[id] (retire)",
    expect: { anonymous: 401, viewer: 403, designer: 204, lead: 204, outsider: 404 },
    call: async (a) => {
      const id = await freshPart();
      return partRoute.DELETE(await request("DELETE", `/api/parts/${id}`, a), ctx({ id }));
    },
  },
];

describe("authorization matrix: route handlers", () => {
  for (const c of cases) {
    it(c.name, async () => {
      const got: Record<string, number> = {};
      for (const w of WHO) got[w] = (await c.call(actor(w))).status;
      expect(got).toEqual(c.expect);
    });
  }

  it("never shows another team's scenarios in the list", async () => {
    const r = await scenarios.GET(await request("GET", "/api/scenarios?pageSize=100", f.outsider), ctx({}));
    const data = (await r.json()) as { items: { id: string }[] };
    expect(data.items.some((s) => s.id === f.scenarioId)).toBe(false);
  });
});

describe("route handlers: authentication first, then validation with proper statuses", () => {
  it("answers 401 to anonymous requests whatever their body, query or id", async () => {
    expect((await scenarios.POST(await request("POST", "/api/scenarios", null, undefined, "{not json"), ctx({}))).status).toBe(401);
    expect((await scenario.PATCH(await request("PATCH", "/api/scenarios/nope", null, { junk: true }), ctx({ id: "nope" }))).status).toBe(401);
    expect((await scenarios.GET(await request("GET", "/api/scenarios?page=-3&sort=bad", null), ctx({}))).status).toBe(401);
    const big = "x".repeat(2_000_000);
    expect((await scenarios.POST(await request("POST", "/api/scenarios", null, undefined, big), ctx({}))).status).toBe(401);
  });

  it("answers 400 with field errors, 413 over the size limit, 404 for unknown ids", async () => {
    const bad = await scenarios.POST(await request("POST", "/api/scenarios", f.designer, { title: "", template: "sink-npn" }), ctx({}));
    expect(bad.status).toBe(400);
    const badJson = (await bad.json()) as { fieldErrors: Record<string, string[]> };
    expect(Object.keys(badJson.fieldErrors)).toEqual(["title"]);

    const notJson = await scenarios.POST(await request("POST", "/api/scenarios", f.designer, undefined, "{oops"), ctx({}));
    expect(notJson.status).toBe(400);

    const badQuery = await scenarios.GET(await request("GET", "/api/scenarios?sort=colour&page=0", f.viewer), ctx({}));
    expect(badQuery.status).toBe(400);
    expect(Object.keys(((await badQuery.json()) as { fieldErrors: object }).fieldErrors).sort()).toEqual(["page", "sort"]);

    const huge = await scenarios.POST(
      await request("POST", "/api/scenarios", f.designer, { title: "Huge", template: "sink-npn", body: { blob: "x".repeat(300 * 1024) } }),
      ctx({}),
    );
    expect(huge.status).toBe(413);

    const unknown = "00000000-0000-4000-8000-000000000000";
    expect((await scenario.GET(await request("GET", `/api/scenarios/${unknown}`, f.viewer), ctx({ id: unknown }))).status).toBe(404);
    expect((await scenario.GET(await request("GET", "/api/scenarios/not-an-id", f.viewer), ctx({ id: "not-an-id" }))).status).toBe(404);
  });

  it("answers 409 with both versions' information on a stale save, and writes nothing", async () => {
    const id = await freshScenario();
    const base = (await db()("scenarios").where({ id }).first()).current_revision_id;
    const first = await scenario.PATCH(await request("PATCH", `/api/scenarios/${id}`, f.designer, { baseRevisionId: base, note: "mine", body: scenarioBody({ senseResistor: 0.33 }) }), ctx({ id }));
    expect(first.status).toBe(200);
    const stale = await scenario.PATCH(await request("PATCH", `/api/scenarios/${id}`, f.lead, { baseRevisionId: base, note: "theirs", body: scenarioBody({ senseResistor: 0.22 }) }), ctx({ id }));
    expect(stale.status).toBe(409);
    const body = (await stale.json()) as { conflict: { current: { number: number; body: { parts: { senseResistor: number } }; author: string } } };
    expect(body.conflict.current).toMatchObject({ number: 2, author: f.designer.name });
    expect(body.conflict.current.body.parts.senseResistor).toBe(0.33);
    expect((await db()("revisions").where({ scenario_id: id })).length).toBe(2);
  });

  it("answers 429 once a team has sent its hourly share of invitations", async () => {
    const { MAX_INVITATIONS_PER_HOUR } = await import("@/lib/db/teams");
    const already = await db()("invitations").where({ team_id: f.outsider.teamId }).where("created_at", ">", new Date(Date.now() - 3600_000));
    const rows = Array.from({ length: MAX_INVITATIONS_PER_HOUR - already.length }, (_, i) => ({
      team_id: f.outsider.teamId, email: `flood${i}@fixture.test`, role: "viewer", token_hash: `flood-${f.outsider.teamId}-${i}`, invited_by: f.outsider.id, expires_at: new Date(Date.now() + 3600_000),
    }));
    if (rows.length) await db()("invitations").insert(rows);
    const r = await invitations.POST(await request("POST", "/api/team/invitations", f.outsider, { email: "one.more@fixture.test", role: "viewer" }), ctx({}));
    expect(r.status).toBe(429);
    expect(((await r.json()) as { error: string }).error).toMatch(/last hour/);
  });

  it("refuses a designer deleting someone else's scenario (owner or lead only)", async () => {
    const id = (await createScenario(f.lead, { title: "Lead's", template: "sink-npn" })).id;
    expect((await scenario.DELETE(await request("DELETE", `/api/scenarios/${id}`, f.designer), ctx({ id }))).status).toBe(403);
  });

  it("refuses mutating requests from another origin", async () => {
    const req = new Request("http://127.0.0.1:3999/api/scenarios", {
      method: "POST",
      headers: { host: "127.0.0.1:3999", origin: "http://evil.example", cookie: (await cookieFor(f.designer))!, "content-type": "application/json" },
      body: JSON.stringify({ title: "x", template: "sink-npn" }),
    });
    expect((await scenarios.POST(req, ctx({}))).status).toBe(403);
  });

  it("ends a session when the password changed since (session version)", async () => {
    const stale = { ...f.viewer, sessionVersion: f.viewer.sessionVersion - 1 };
    expect((await scenarios.GET(await request("GET", "/api/scenarios", stale), ctx({}))).status).toBe(401);
  });
});

describe("authorization matrix: server actions", () => {
  async function as(w: Who) {
    jar.cookie = await cookieFor(actor(w));
  }
  async function outcome<T extends { ok: boolean }>(w: Who, fn: () => Promise<T>): Promise<"ok" | "denied"> {
    await as(w);
    const r = await fn();
    return r.ok ? "ok" : "denied";
  }

  it("saveScenarioRevision: designers and leads of the team only", async () => {
    const got: Record<string, string> = {};
    for (const w of WHO) {
      const id = await freshScenario();
      const base = (await db()("scenarios").where({ id }).first()).current_revision_id;
      got[w] = await outcome(w, () => saveScenarioRevision({ scenarioId: id, baseRevisionId: base, note: "n", body: scenarioBody({ senseResistor: 0.5 }) }));
    }
    expect(got).toEqual({ anonymous: "denied", viewer: "denied", designer: "ok", lead: "ok", outsider: "denied" });
  });

  it("saveScenarioRevision: a stale base comes back as a conflict with the current revision", async () => {
    const id = await freshScenario();
    const base = (await db()("scenarios").where({ id }).first()).current_revision_id;
    await as("designer");
    expect((await saveScenarioRevision({ scenarioId: id, baseRevisionId: base, note: "one", body: scenarioBody({ senseResistor: 0.1 }) })).ok).toBe(true);
    await as("lead");
    const r = await saveScenarioRevision({ scenarioId: id, baseRevisionId: base, note: "two", body: scenarioBody({ senseResistor: 0.2 }) });
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.conflict?.current.number).toBe(2);
      expect((r.conflict?.current.body as { parts: { senseResistor: number } }).parts.senseResistor).toBe(0.1);
    }
  });

  it("forkScenario: designers and leads of the team only", async () => {
    const got: Record<string, string> = {};
    for (const w of WHO) got[w] = await outcome(w, () => forkScenario({ revisionId: f.revisionId }));
    expect(got).toEqual({ anonymous: "denied", viewer: "denied", designer: "ok", lead: "ok", outsider: "denied" });
  });

  it("setScenarioDeleted: the owner or a lead only", async () => {
    const got: Record<string, string> = {};
    for (const w of WHO) {
      const id = (await createScenario(f.lead, { title: "Owned by lead", template: "sink-npn" })).id;
      got[w] = await outcome(w, () => setScenarioDeleted({ scenarioId: id, deleted: true }));
    }
    // The designer does not own these (the lead does), so only the lead may delete them.
    expect(got).toEqual({ anonymous: "denied", viewer: "denied", designer: "denied", lead: "ok", outsider: "denied" });
  });

  it("switchTeamAction (validatedAction): session first, then the form's fields, then membership", async () => {
    const { switchTeamAction } = await import("@/app/(account)/actions");
    const form = (teamId: string) => {
      const fd = new FormData();
      fd.set("teamId", teamId);
      return fd;
    };
    jar.cookie = undefined;
    expect(await switchTeamAction({}, form(f.outsider.teamId))).toEqual({ message: "Your session has ended: sign in again." });
    await as("viewer");
    const bad = await switchTeamAction({}, form("not-a-team"));
    expect(Object.keys(bad.fieldErrors ?? {})).toEqual(["teamId"]);
    expect(await switchTeamAction({}, form(f.outsider.teamId))).toEqual({ message: "You are not a member of that team." });
    // Into a team the user belongs to: the action ends in a redirect to the scenarios (Next's redirect throws).
    await as("outsider");
    await expect(switchTeamAction({}, form(f.outsider.teamId))).rejects.toThrow(/NEXT_REDIRECT/);
  });

  it("commentOnScenario: every member of the team, viewers included", async () => {
    const got: Record<string, string> = {};
    for (const w of WHO) got[w] = await outcome(w, () => commentOnScenario({ scenarioId: f.scenarioId, body: `from ${w}` }));
    expect(got).toEqual({ anonymous: "denied", viewer: "ok", designer: "ok", lead: "ok", outsider: "denied" });
  });
});

// ── Bench traces and the library: the same matrix (added in the server review) ────────────────────────────────

/** A small capture (ms, mA) uploaded by `a` to a scenario; the response as the route gives it. */
async function uploadTrace(a: Actor | null, scenarioId: string): Promise<Response> {
  const lines = ["Time (ms),I (mA)"];
  for (let k = 0; k < 40; k++) lines.push(`${(k * 0.1).toFixed(1)},${k < 10 ? 0 : 500}`);
  const form = new FormData();
  form.set("file", new File([lines.join("\n")], "bench.csv", { type: "text/csv" }));
  const headers: Record<string, string> = { host: "127.0.0.1:3999" };
  const cookie = await cookieFor(a);
  if (cookie) headers.cookie = cookie;
  return scenarioTraces.POST(new Request(`http://127.0.0.1:3999/api/scenarios/${scenarioId}/traces`, { method: "POST", headers, body: form }), ctx({ id: scenarioId }));
}

async function designerTrace(): Promise<string> {
  const r = await uploadTrace(f.designer, f.scenarioId);
  expect(r.status).toBe(201);
  return ((await r.json()) as { id: string }).id;
}

/** A scenario of the designer's with one trace, submitted for validation: [entryId, scenarioId]. */
async function submittedEntry(): Promise<{ entryId: string; scenarioId: string }> {
  const s = await createScenario(f.designer, { title: "Entry target", template: "sink-npn" });
  const t = await uploadTrace(f.designer, s.id);
  const traceId = ((await t.json()) as { id: string }).id;
  // a passing comparison: validating needs no override
  const r = await submitForValidation(f.designer, s.id, { note: "bench", traceIds: [traceId], keyFigures: {}, comparisons: [{ traceId, channel: 0, offset: 0, verdict: "pass", rows: [] }] });
  return { entryId: r.entryId, scenarioId: s.id };
}

/** The same with a failing comparison: validating it needs an override with a written reason. */
async function failingEntry(): Promise<{ entryId: string; scenarioId: string }> {
  const s = await createScenario(f.designer, { title: "Failing target", template: "sink-npn" });
  const t = await uploadTrace(f.designer, s.id);
  const traceId = ((await t.json()) as { id: string }).id;
  const r = await submitForValidation(f.designer, s.id, { note: "bench", traceIds: [traceId], keyFigures: {}, comparisons: [{ traceId, channel: 0, offset: 0, verdict: "fail", rows: [] }] });
  return { entryId: r.entryId, scenarioId: s.id };
}

const libraryCases: Case[] = [
  {
    name: "GET /api/scenarios/[id]/traces",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => scenarioTraces.GET(await request("GET", `/api/scenarios/${f.scenarioId}/traces`, a), ctx({ id: f.scenarioId })),
  },
  {
    name: "POST /api/scenarios/[id]/traces",
    expect: { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 404 },
    call: (a) => uploadTrace(a, f.scenarioId),
  },
  {
    name: "GET /api/traces/[id]",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const id = await designerTrace();
      return traceRoute.GET(await request("GET", `/api/traces/${id}`, a), ctx({ id }));
    },
  },
  {
    name: "PATCH /api/traces/[id] (correct a channel's unit)",
    expect: { anonymous: 401, viewer: 403, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const id = await designerTrace();
      return traceRoute.PATCH(await request("PATCH", `/api/traces/${id}`, a, { channel: 0, sourceUnit: "mA" }), ctx({ id }));
    },
  },
  {
    name: "DELETE /api/traces/[id] (uploaded by the designer)",
    expect: { anonymous: 401, viewer: 403, designer: 204, lead: 204, outsider: 404 },
    call: async (a) => {
      const id = await designerTrace();
      return traceRoute.DELETE(await request("DELETE", `/api/traces/${id}`, a), ctx({ id }));
    },
  },
  {
    name: "GET /api/library",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 200 },
    call: async (a) => library.GET(await request("GET", "/api/library?status=submitted", a), ctx({})),
  },
  {
    name: "POST /api/library (a trace of the team's scenario)",
    expect: { anonymous: 401, viewer: 403, designer: 201, lead: 201, outsider: 404 },
    call: async (a) => {
      const s = await createScenario(f.designer, { title: "Submit target", template: "sink-npn" });
      const t = ((await (await uploadTrace(f.designer, s.id)).json()) as { id: string }).id;
      return library.POST(await request("POST", "/api/library", a, { scenarioId: s.id, note: "bench", traceIds: [t] }), ctx({}));
    },
  },
  {
    name: "GET /api/library/[id]",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const { entryId } = await submittedEntry();
      return libraryEntry.GET(await request("GET", `/api/library/${entryId}`, a), ctx({ id: entryId }));
    },
  },
  {
    name: "PATCH /api/library/[id] { status: validated }",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 200, outsider: 404 },
    call: async (a) => {
      const { entryId } = await submittedEntry();
      return libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, a, { status: "validated" }), ctx({ id: entryId }));
    },
  },
  {
    name: "PATCH /api/library/[id] { status: validated, overrideReason } (failing evidence)",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 200, outsider: 404 },
    call: async (a) => {
      const { entryId } = await failingEntry();
      return libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, a, { status: "validated", overrideReason: "Probe setting was wrong on the bench." }), ctx({ id: entryId }));
    },
  },
  {
    name: "PATCH /api/library/[id] { status: validated } without a reason (failing evidence)",
    expect: { anonymous: 401, viewer: 403, designer: 403, lead: 400, outsider: 404 },
    call: async (a) => {
      const { entryId } = await failingEntry();
      return libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, a, { status: "validated" }), ctx({ id: entryId }));
    },
  },
  {
    name: "PATCH /api/library/[id] { withdraw } (submitted by the designer)",
    expect: { anonymous: 401, viewer: 403, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const { entryId } = await submittedEntry();
      return libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, a, { withdraw: true }), ctx({ id: entryId }));
    },
  },
  {
    name: "PATCH /api/library/[id] { comment }",
    expect: { anonymous: 401, viewer: 200, designer: 200, lead: 200, outsider: 404 },
    call: async (a) => {
      const { entryId } = await submittedEntry();
      return libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, a, { comment: "looks right" }), ctx({ id: entryId }));
    },
  },
];

describe("authorization matrix: bench traces and library route handlers", () => {
  for (const c of libraryCases) {
    it(c.name, async () => {
      const got: Record<string, number> = {};
      for (const w of WHO) got[w] = (await c.call(actor(w))).status;
      expect(got).toEqual(c.expect);
    });
  }

  it("answers 400 naming the field for unknown keys in a library PATCH", async () => {
    const { entryId } = await submittedEntry();
    const r = await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, f.lead, { status: "validated", validatedBy: f.viewer.id }), ctx({ id: entryId }));
    expect(r.status).toBe(400);
    expect(JSON.stringify((await r.json()) as object)).toMatch(/validatedBy/);
    expect((await db()("library_entries").where({ id: entryId }).first()).status).toBe("submitted");
  });
});

describe("authorization matrix: library server actions", () => {
  function form(fields: Record<string, string>): FormData {
    const fd = new FormData();
    for (const [k, v] of Object.entries(fields)) fd.set(k, v);
    return fd;
  }
  /** "ok" when the action went through (a redirect, or ok: true), else the refusal. */
  async function run(w: Who, fn: () => Promise<{ ok?: boolean; message?: string }>): Promise<"ok" | "denied"> {
    jar.cookie = await cookieFor(actor(w));
    try {
      const r = await fn();
      return r.ok ? "ok" : "denied";
    } catch (e) {
      if (e instanceof Error && /NEXT_REDIRECT/.test(e.message)) return "ok";
      throw e;
    }
  }

  it("startFromEntryAction: designers and leads of the team, from a validated entry only", async () => {
    const { entryId } = await submittedEntry();
    jar.cookie = await cookieFor(f.designer);
    expect((await startFromEntryAction({}, form({ entryId }))).message).toMatch(/Only validated entries/);
    await changeEntryStatus(f.lead, entryId, "validate");
    const got: Record<string, string> = {};
    for (const w of WHO) got[w] = await run(w, () => startFromEntryAction({}, form({ entryId })));
    expect(got).toEqual({ anonymous: "denied", viewer: "denied", designer: "ok", lead: "ok", outsider: "denied" });
    jar.cookie = await cookieFor(f.designer);
    expect(Object.keys((await startFromEntryAction({}, form({ entryId: "nope" }))).fieldErrors ?? {})).toEqual(["entryId"]);
  });

  it("setTolerancesAction: leads only; bad numbers come back naming the field", async () => {
    const good = { riseTimePct: "20", overshootPts: "5", settlingTimePct: "25", ringingPct: "15", rmsPctOfStep: "5", settleBandPct: "2" };
    const got: Record<string, string> = {};
    for (const w of WHO) got[w] = await run(w, () => setTolerancesAction({}, form(good)));
    // The outsider leads their own team: the tolerances they set are their team's.
    expect(got).toEqual({ anonymous: "denied", viewer: "denied", designer: "denied", lead: "ok", outsider: "ok" });
    jar.cookie = await cookieFor(f.lead);
    const bad = await setTolerancesAction({}, form({ ...good, settleBandPct: "80", ringingPct: "lots" }));
    expect(Object.keys(bad.fieldErrors ?? {}).sort()).toEqual(["ringingPct", "settleBandPct"]);
  });
});

describe("signInAction: the return path", () => {
  async function landing(next: string): Promise<string> {
    const { signInAction } = await import("@/app/(account)/actions");
    const fd = new FormData();
    fd.set("email", f.designer.email);
    fd.set("password", FIXTURE_PASSWORD);
    fd.set("next", next);
    const e = await signInAction({}, fd).then(() => null, (x: unknown) => x);
    // Next's redirect() throws an error whose digest is "NEXT_REDIRECT;<type>;<url>;<status>;".
    const digest = String((e as { digest?: string } | null)?.digest ?? "");
    expect(digest).toMatch(/^NEXT_REDIRECT;/);
    return digest.split(";")[2]!;
  }

  it("goes back to a page of this site, never to another site (tab, newline and backslash tricks included)", async () => {
    expect(await landing("/scenarios/abc?x=1")).toBe("/scenarios/abc?x=1");
    for (const evil of ["//evil.example", "/\t/evil.example", "/\n/evil.example", "/\\evil.example", "https://evil.example"]) {
      const to = await landing(evil);
      expect(new URL(to, "https://quell.example").origin).toBe("https://quell.example");
    }
  });
});

// ── Coverage: every route handler and every server action is in a matrix above ─────────────────────────────────

const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

/** Every `app/api/**\/route.ts` with the methods it exports, as "METHOD /api/path". */
async function routeHandlers(): Promise<{ name: string; handler: (req: Request, c: { params: Promise<Record<string, string>> }) => Promise<Response> }[]> {
  const { readdirSync } = await import("node:fs");
  const { join, relative, resolve } = await import("node:path");
  const root = resolve("app/api");
  const files: string[] = [];
  const walk = (dir: string) => {
    for (const e of readdirSync(dir, { withFileTypes: true })) {
      if (e.isDirectory()) walk(join(dir, e.name));
      else if (e.name === "route.ts") files.push(join(dir, e.name));
    }
  };
  walk(root);
  const out = [];
  for (const file of files.sort()) {
    const path = "/api/" + relative(root, file).replace(/\/?route\.ts$/, "");
    const mod = (await import(file)) as Record<string, unknown>;
    for (const m of METHODS) {
      if (typeof mod[m] === "function") out.push({ name: `${m} ${path.replace(/\/$/, "")}`, handler: mod[m] as never });
    }
  }
  return out;
}

/** Routes anyone may call: the health check only. */
const PUBLIC_ROUTES = new Set(["GET /api/health"]);

describe("coverage of the authorization matrix", () => {
  it("every route handler has a row in a matrix", async () => {
    const covered = new Set([...cases, ...libraryCases].map((c) => c.name.split(" ").slice(0, 2).join(" ")));
    const missing = (await routeHandlers()).map((r) => r.name).filter((n) => !PUBLIC_ROUTES.has(n) && !covered.has(n));
    expect(missing).toEqual([]);
  });

  it("every server action is tested above, or is one of the account forms used before signing in", async () => {
    const files = ["app/scenarios/[id]/actions", "app/library/actions", "app/(account)/actions"];
    const exported: string[] = [];
    for (const f of files) {
      const mod = (await import(`@/${f}`)) as Record<string, unknown>;
      exported.push(...Object.keys(mod).filter((k) => typeof mod[k] === "function"));
    }
    const inMatrix = ["saveScenarioRevision", "forkScenario", "setScenarioDeleted", "commentOnScenario", "switchTeamAction", "startFromEntryAction", "setTolerancesAction", "signInAction"];
    // Before signing in, or ending one's own session: they act on no team's data (tests in accounts and hardening).
    const accountForms = ["signUpAction", "signOutAction", "signOutEverywhereAction", "forgotPasswordAction", "resetPasswordAction", "acceptInvitationAction", "acceptWithNewAccountAction", "createTeamAction"];
    expect(exported.filter((n) => !inMatrix.includes(n) && !accountForms.includes(n))).toEqual([]);
  });
});

describe("every route answers 401 to anonymous requests before reading the body", () => {
  it("401 for each route and method, and the request body is never pulled", async () => {
    const routes = (await routeHandlers()).filter((r) => !PUBLIC_ROUTES.has(r.name));
    expect(routes.length).toBeGreaterThan(15);
    const got: Record<string, string> = {};
    for (const r of routes) {
      let pulled = false;
      // highWaterMark 0: nothing is pulled until someone reads the body.
      const body = new ReadableStream<Uint8Array>(
        {
          pull(c) {
            pulled = true;
            c.enqueue(new TextEncoder().encode("{not json"));
            c.close();
          },
        },
        { highWaterMark: 0 },
      );
      const method = r.name.split(" ")[0]!;
      const url = `http://127.0.0.1:3999${r.name.split(" ")[1]!.replace("[id]", "not-an-id")}?page=-1&userId=x&id=y`;
      const init: RequestInit & { duplex?: "half" } = { method, headers: { host: "127.0.0.1:3999", "content-type": "application/json", cookie: "quell_session=garbage" } };
      if (method !== "GET") Object.assign(init, { body, duplex: "half" });
      const res = await r.handler(new Request(url, init), ctx({ id: "not-an-id" }));
      got[r.name] = `${res.status}${pulled ? " (body read)" : ""}`;
    }
    expect(got).toEqual(Object.fromEntries(routes.map((r) => [r.name, "401"])));
  });

  it("the probe does see a body being read (a signed-in request of the same shape)", async () => {
    let pulled = false;
    const body = new ReadableStream<Uint8Array>(
      {
        pull(c) {
          pulled = true;
          c.enqueue(new TextEncoder().encode("{not json"));
          c.close();
        },
      },
      { highWaterMark: 0 },
    );
    const init = { method: "POST", headers: { host: "127.0.0.1:3999", "content-type": "application/json", cookie: (await cookieFor(f.designer))! }, body, duplex: "half" };
    const res = await scenarios.POST(new Request("http://127.0.0.1:3999/api/scenarios", init as RequestInit), ctx({}));
    expect([res.status, pulled]).toEqual([400, true]);
  });
});
