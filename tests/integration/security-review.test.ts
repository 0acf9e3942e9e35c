import { afterAll, beforeAll, describe, expect, it } from "vitest";


import { db } from "@/lib/db/knex";
import * as scenarios from "@/app/api/scenarios/route";
import * as revisions from "@/app/api/scenarios/[id]/revisions/route";
import * as comments from "@/app/api/scenarios/[id]/comments/route";
import * as shareLinks from "@/app/api/scenarios/[id]/share-links/route";
import * as scenarioTraces from "@/app/api/scenarios/[id]/traces/route";
import * as trace from "@/app/api/traces/[id]/route";
import * as library from "@/app/api/library/route";
import * as libraryEntry from "@/app/api/library/[id]/route";
import { createAccountFromInvitation, requestPasswordReset, signInWithPassword } from "@/lib/auth/accounts";
import { MAX_FAILURES_PER_ACCOUNT } from "@/lib/db/signInAttempts";
import { changeRole, createInvitation, removeMember, revokeInvitation } from "@/lib/db/teams";
import { createScenario } from "@/lib/scenarios/save";
import { createPasswordReset, MAX_RESETS_PER_HOUR } from "@/lib/db/passwordResets";
import { DomainError } from "@/lib/errors";
import { teamOutbox } from "@/lib/db/outbox";
import { invitationMail, passwordResetMail } from "@/lib/mail/messages";
import { libraryMail } from "@/lib/library/mail";
import { SESSION_COOKIE } from "@/lib/auth/session-config";
import { closeDb, cookieFor, ctx, makeFixture, ORIGIN, request, type Actor, type Fixture } from "./support/fixtures";

let f: Fixture;
/** A second, independent team (its own lead, designer, viewer, scenario) for cross-team probes. */
let g: Fixture;
beforeAll(async () => {
  f = await makeFixture("secrev");
  g = await makeFixture("secrev-b");
});
afterAll(closeDb);

function csv(rows = 50): string {
  const lines = ["Time (ms),I (mA)"];
  for (let k = 0; k < rows; k++) lines.push(`${(k * 0.1).toFixed(1)},${k < 10 ? 0 : 750}`);
  return lines.join("\n");
}

async function upload(a: Actor, scenarioId: string): Promise<Response> {
  const form = new FormData();
  form.set("file", new File([csv()], "bench.csv", { type: "text/csv" }));
  const headers: Record<string, string> = { host: "127.0.0.1:3999", cookie: (await cookieFor(a))! };
  return scenarioTraces.POST(new Request(`${ORIGIN}/api/scenarios/${scenarioId}/traces`, { method: "POST", headers, body: form }), ctx({ id: scenarioId }));
}

describe("sign-in throttle under concurrent guesses", () => {
  it("lets at most the per-account limit of guesses reach the password check, however many arrive at once", async () => {
    const account = `burst.${f.tag}@fixture.test`;
    const n = 16;
    // Different client addresses, so only the per-account limit applies.
    const results = await Promise.all(Array.from({ length: n }, (_, i) => signInWithPassword(account, `guess-${i}`, `10.77.${i}.1`)));
    const checked = results.filter((r) => !r.ok && !r.throttled).length;
    expect(results.every((r) => !r.ok)).toBe(true);
    // Before the fix every guess read the count before any was recorded, and all 16 were checked.
    expect(checked).toBeLessThanOrEqual(MAX_FAILURES_PER_ACCOUNT);
    // Throttled attempts are not recorded: the rows are exactly the guesses that were checked.
    const rows = await db()("sign_in_attempts").where({ account });
    expect(rows.length).toBe(checked);
  });
});

describe("the last-lead rule under concurrent changes", () => {
  it("two leads demoting (or removing) each other at once: one wins, the other is refused, never a server error", async () => {
    for (let round = 0; round < 4; round++) {
      const h = await makeFixture(`lastlead${round}`);
      await db()("memberships").where({ team_id: h.lead.teamId, user_id: h.designer.id }).update({ role: "lead" });
      const a = h.lead;
      const b: Actor = { ...h.designer, role: "lead" };
      const settled = await Promise.allSettled(
        round % 2 === 0 ? [changeRole(a, b.id, "viewer"), changeRole(b, a.id, "viewer")] : [removeMember(a, b.id), removeMember(b, a.id)],
      );
      const refused = settled.filter((s) => s.status === "rejected");
      for (const s of refused) {
        expect(s.status === "rejected" && s.reason).toBeInstanceOf(DomainError);
        expect([403, 409]).toContain((s as PromiseRejectedResult).reason.status);
      }
      expect(settled.filter((s) => s.status === "fulfilled").length).toBe(1);
      const leads = await db()("memberships").where({ team_id: h.lead.teamId, role: "lead" });
      expect(leads.length).toBe(1);
    }
  });
});

describe("library submission under concurrent requests", () => {
  it("two simultaneous first submissions of one revision: one 201, one 409, one entry (never a server error)", async () => {
    for (let round = 0; round < 6; round++) {
      const s = await createScenario(f.designer, { title: `Race ${round}`, template: "sink-npn" });
      const up = await upload(f.designer, s.id);
      expect(up.status).toBe(201);
      const traceId = (await up.json()).id as string;
      const body = { scenarioId: s.id, note: "Bench agrees.", traceIds: [traceId] };
      const reqs = [await request("POST", "/api/library", f.designer, body), await request("POST", "/api/library", f.lead, body)];
      const [r1, r2] = await Promise.all(reqs.map((r) => library.POST(r, ctx({}))));
      expect([r1!.status, r2!.status].sort()).toEqual([201, 409]);
      expect((await db()("library_entries").where({ revision_id: s.revisionId })).length).toBe(1);
    }
  });
});

describe("ids of another team are refused wherever they are accepted", () => {
  it("revisions, forks-by-revision, comments and share links do not take another team's revision id", async () => {
    // A revision of team g, asked for through team f's own scenario: 404, not g's body.
    const r = await revisions.GET(await request("GET", `/api/scenarios/${f.scenarioId}/revisions?revision=${g.revisionId}`, f.viewer), ctx({ id: f.scenarioId }));
    expect(r.status).toBe(404);
    expect(JSON.stringify(await r.json())).not.toContain("senseResistor");
    const created = await scenarios.POST(await request("POST", "/api/scenarios", f.designer, { title: "Copy of theirs", template: "sink-npn", fromRevisionId: g.revisionId }), ctx({}));
    expect(created.status).toBe(404);
    const before = (await db()("comments").where({ scenario_id: f.scenarioId })).length;
    const c = await comments.POST(await request("POST", `/api/scenarios/${f.scenarioId}/comments`, f.viewer, { body: "hi", revisionId: g.revisionId }), ctx({ id: f.scenarioId }));
    expect(c.status).toBe(400);
    expect((await c.json()).error).toMatch(/revisionId/);
    expect((await db()("comments").where({ scenario_id: f.scenarioId })).length).toBe(before);
    const l = await shareLinks.POST(await request("POST", `/api/scenarios/${f.scenarioId}/share-links`, f.designer, { revisionId: g.revisionId, days: 3 }), ctx({ id: f.scenarioId }));
    expect(l.status).toBe(400);
    expect((await db()("share_links").where({ revision_id: g.revisionId })).length).toBe(0);
  });

  it("traces: another team's trace id is 404 to read or delete; another team's trace cannot be evidence", async () => {
    const up = await upload(g.designer, g.scenarioId);
    expect(up.status).toBe(201);
    const theirs = (await up.json()).id as string;
    expect((await trace.GET(await request("GET", `/api/traces/${theirs}`, f.lead), ctx({ id: theirs }))).status).toBe(404);
    expect((await trace.DELETE(await request("DELETE", `/api/traces/${theirs}`, f.lead), ctx({ id: theirs }))).status).toBe(404);
    expect(await db()("bench_traces").where({ id: theirs }).first()).toBeTruthy();
    expect((await scenarioTraces.GET(await request("GET", `/api/scenarios/${g.scenarioId}/traces`, f.lead), ctx({ id: g.scenarioId }))).status).toBe(404);
    const sub = await library.POST(await request("POST", "/api/library", f.designer, { scenarioId: f.scenarioId, note: "n", traceIds: [theirs] }), ctx({}));
    expect(sub.status).toBe(400);
    expect((await sub.json()).error).toMatch(/traceIds/);
    // Another team's scenario id with one's own trace: 404.
    const own = (await (await upload(f.designer, f.scenarioId)).json()).id as string;
    expect((await library.POST(await request("POST", "/api/library", f.designer, { scenarioId: g.scenarioId, note: "n", traceIds: [own] }), ctx({}))).status).toBe(404);
  });

  it("library entries of another team: 404 to read, change or comment", async () => {
    const up = await upload(g.designer, g.scenarioId);
    const t = (await up.json()).id as string;
    const sub = await library.POST(await request("POST", "/api/library", g.designer, { scenarioId: g.scenarioId, note: "theirs", traceIds: [t] }), ctx({}));
    expect(sub.status).toBe(201);
    const entryId = (await sub.json()).entryId as string;
    expect((await libraryEntry.GET(await request("GET", `/api/library/${entryId}`, f.lead), ctx({ id: entryId }))).status).toBe(404);
    for (const body of [{ status: "validated" }, { withdraw: true }, { comment: "sneaky" }]) {
      const r = await libraryEntry.PATCH(await request("PATCH", `/api/library/${entryId}`, f.lead, body), ctx({ id: entryId }));
      expect(r.status).toBe(404);
    }
    expect((await db()("library_entries").where({ id: entryId }).first()).status).toBe("submitted");
    const list = await library.GET(await request("GET", "/api/library", f.lead), ctx({}));
    expect(((await list.json()).entries as { id: string }[]).some((e) => e.id === entryId)).toBe(false);
  });
});

describe("a session cookie that cannot be read", () => {
  it("is anonymous (401), not a server error", async () => {
    const req = new Request(`${ORIGIN}/api/scenarios`, { headers: { host: "127.0.0.1:3999", cookie: `${SESSION_COOKIE}=%E0%A4%A` } });
    const r = await scenarios.GET(req, ctx({}));
    expect(r.status).toBe(401);
  });
});

describe("development outbox: nobody else's links", () => {
  it("hides other teams' invitation links and other people's reset links from a lead", async () => {
    // Team g's lead invites team f's viewer (a member of f): the mail is addressed to a member of f.
    const { token: gToken } = await createInvitation(g.lead, f.viewer.email, "designer");
    // Team f's lead invites g's viewer, which makes that address one of f's invitees.
    const { token: fToken } = await createInvitation(f.lead, g.viewer.email, "viewer");
    const base = "http://localhost:3000";
    const mails = [
      { to: f.viewer.email, mail: invitationMail({ to: f.viewer.email, teamName: g.lead.teamName, inviterName: g.lead.name, role: "designer", link: `${base}/invitations/${gToken}`, expiresAt: new Date() }) },
      { to: g.viewer.email, mail: invitationMail({ to: g.viewer.email, teamName: f.lead.teamName, inviterName: f.lead.name, role: "viewer", link: `${base}/invitations/${fToken}`, expiresAt: new Date() }) },
      { to: f.viewer.email, mail: passwordResetMail({ to: f.viewer.email, link: `${base}/reset-password?token=${await createPasswordReset(f.viewer.id)}`, expiresAt: new Date() }) },
      { to: g.viewer.email, mail: passwordResetMail({ to: g.viewer.email, link: `${base}/reset-password?token=${await createPasswordReset(g.viewer.id)}`, expiresAt: new Date() }) },
      { to: f.lead.email, mail: passwordResetMail({ to: f.lead.email, link: `${base}/reset-password?token=${await createPasswordReset(f.lead.id)}`, expiresAt: new Date() }) },
      { to: f.viewer.email, mail: libraryMail({ to: { email: f.viewer.email, name: "V" }, subject: `lib-g-${g.tag}`, lines: ["x"], entryId: "00000000-0000-4000-8000-000000000001" }) },
    ];
    for (const { to, mail } of mails) {
      await db()("dev_mailbox").insert({ to_address: to, from_address: "quell@localhost", subject: `${mail.subject} ${f.tag}`, text_body: mail.text, html_body: mail.html ?? "" });
    }
    const seen = await teamOutbox(f.lead.teamId, 200, f.lead.email);
    const texts = seen.map((m) => m.text).join("\n");
    // f's own invitation is there; g's invitation to f's member is not (it would let f's lead join g in their place).
    expect(texts).toContain(`/invitations/${fToken}`);
    expect(texts).not.toContain(`/invitations/${gToken}`);
    // Reset links: only the lead's own.
    const resets = seen.filter((m) => m.text.includes("/reset-password?token="));
    expect(resets.map((m) => m.to)).toEqual([f.lead.email]);
    // A library notice about an entry that is not f's is not shown.
    expect(seen.some((m) => m.subject.startsWith(`lib-g-${g.tag}`))).toBe(false);
    // g's lead sees g's invitation mail to f's viewer? No: f's viewer is neither g's member nor (any more) pending...
    // it is g's invitee, so g's lead does see its own invitation link.
    expect((await teamOutbox(g.lead.teamId, 200, g.lead.email)).map((m) => m.text).join("\n")).toContain(`/invitations/${gToken}`);
  });
});

describe("password-reset flood guard under concurrent requests", () => {
  it("issues at most the hourly number of links however many requests arrive at once", async () => {
    const [u] = await db()("users").insert({ email: `resetburst.${f.tag}@fixture.test`, name: "Burst", password_hash: "x" }).returning("*");
    const sent = await Promise.all(Array.from({ length: 8 }, () => requestPasswordReset(u.email)));
    expect(sent.filter(Boolean).length).toBe(MAX_RESETS_PER_HOUR);
    expect((await db()("password_resets").where({ user_id: u.id })).length).toBe(MAX_RESETS_PER_HOUR);
  });
});

describe("creating an account from an invitation", () => {
  it("creates the account and the membership together, in the invitation's role", async () => {
    const email = `newcomer.${f.tag}@fixture.test`;
    const { token } = await createInvitation(f.lead, email, "designer");
    const { user, teamId } = await createAccountFromInvitation(token, { name: "New Comer", password: "newcomer-password" });
    expect(teamId).toBe(f.lead.teamId);
    expect(user.email).toBe(email);
    expect((await db()("memberships").where({ team_id: teamId, user_id: user.id }).first()).role).toBe("designer");
  });

  it("leaves no team-less account behind when the invitation was withdrawn in the meantime", async () => {
    const email = `withdrawn.${f.tag}@fixture.test`;
    const { invitation, token } = await createInvitation(f.lead, email, "viewer");
    await revokeInvitation(f.lead, invitation.id);
    const e = await createAccountFromInvitation(token, { name: "Too Late", password: "too-late-password" }).catch((x) => x);
    expect(e).toBeInstanceOf(DomainError);
    expect((e as DomainError).status).toBe(410);
    expect(await db()("users").whereRaw("lower(email) = ?", [email]).first()).toBeUndefined();
  });
});

describe("database connections cannot hang a request", () => {
  it("every app connection carries a statement, lock and idle-transaction timeout", async () => {
    const { LOCK_TIMEOUT_MS, STATEMENT_TIMEOUT_MS } = await import("@/lib/db/knex");
    const show = async (name: string) => ((await db().raw(`show ${name}`)).rows[0] as Record<string, string>)[name];
    // PostgreSQL reports these in its own units (e.g. "15s", "1min"): compare through pg's interval arithmetic.
    const ms = async (name: string) => Number((await db().raw(`select extract(epoch from current_setting(?)::interval) * 1000 as ms`, [name])).rows[0].ms);
    expect(await show("statement_timeout")).not.toBe("0");
    expect(await ms("statement_timeout")).toBe(STATEMENT_TIMEOUT_MS);
    expect(await ms("lock_timeout")).toBe(LOCK_TIMEOUT_MS);
    expect(await ms("idle_in_transaction_session_timeout")).toBeGreaterThan(0);
  });

  it("a lock held elsewhere ends in an error after the lock timeout instead of waiting for ever", async () => {
    const knexFactory = (await import("knex")).default;
    const { appDbConfig } = await import("@/lib/db/knex");
    const short = knexFactory({ ...appDbConfig(), connection: { ...(appDbConfig().connection as object), lock_timeout: 300 } as never });
    try {
      await db().transaction(async (holder) => {
        await holder.raw("select pg_advisory_xact_lock(hashtext(?))", [`hang-test:${f.tag}`]);
        const started = Date.now();
        const e = await short.raw("select pg_advisory_lock(hashtext(?))", [`hang-test:${f.tag}`]).catch((x) => x);
        expect((e as { code?: string }).code).toBe("55P03"); // lock_not_available (PostgreSQL error codes, appendix A)
        expect(Date.now() - started).toBeLessThan(5_000);
      });
    } finally {
      await short.destroy();
    }
  });
});

describe("evidence and trace deletion do not cross", () => {
  it("a submission waits for a trace deletion in progress and then refuses the missing trace (no entry citing a deleted trace)", async () => {
    const s = await createScenario(f.designer, { title: "Evidence race", template: "sink-npn" });
    const traceId = ((await (await upload(f.designer, s.id)).json()) as { id: string }).id;
    const deleting = await db().transaction();
    try {
      await deleting("bench_traces").where({ id: traceId }).forUpdate().first("id");
      let settled = false;
      const pending = library
        .POST(await request("POST", "/api/library", f.designer, { scenarioId: s.id, note: "bench", traceIds: [traceId] }), ctx({}))
        .finally(() => (settled = true));
      await new Promise((r) => setTimeout(r, 300));
      expect(settled).toBe(false);
      await deleting("bench_traces").where({ id: traceId }).delete();
      await deleting.commit();
      const r = await pending;
      expect(r.status).toBe(400);
      expect(((await r.json()) as { error: string }).error).toMatch(/traceIds/);
      expect(await db()("library_entries").where({ scenario_id: s.id }).first()).toBeUndefined();
    } finally {
      if (!deleting.isCompleted()) await deleting.rollback();
    }
  });
});

describe("scenario bodies that are not JSON data", () => {
  it("a cyclic or BigInt body (possible through a server action's decoded argument) is a 400 naming body, not a crash", async () => {
    const { checkScenarioBody } = await import("@/lib/design/scenarioBody");
    const cyclic: Record<string, unknown> = { template: "sink-npn" };
    cyclic.self = cyclic;
    for (const bad of [cyclic, { template: "sink-npn", n: BigInt(1) }]) {
      const e = (() => {
        try {
          checkScenarioBody(bad);
          return null;
        } catch (x) {
          return x;
        }
      })();
      expect(e).toBeInstanceOf(DomainError);
      expect((e as DomainError).status).toBe(400);
      expect((e as DomainError).message).toMatch(/^body:/);
    }
  });
});

describe("PATCH /api/scenarios/[id]: nothing half-applied", () => {
  it("refuses restore together with a new revision (400 naming restore) and leaves the scenario deleted", async () => {
    const scenario = await import("@/app/api/scenarios/[id]/route");
    const s = await createScenario(f.designer, { title: "Half", template: "sink-npn" });
    expect((await scenario.DELETE(await request("DELETE", `/api/scenarios/${s.id}`, f.designer), ctx({ id: s.id }))).status).toBe(204);
    const { scenarioBody } = await import("./support/fixtures");
    const r = await scenario.PATCH(
      await request("PATCH", `/api/scenarios/${s.id}`, f.designer, { restore: true, baseRevisionId: "00000000-0000-4000-8000-000000000000", body: scenarioBody(), note: "stale" }),
      ctx({ id: s.id }),
    );
    expect(r.status).toBe(400);
    expect(Object.keys(((await r.json()) as { fieldErrors: object }).fieldErrors)).toEqual(["restore"]);
    expect((await db()("scenarios").where({ id: s.id }).first()).deleted_at).not.toBeNull();
  });
});
