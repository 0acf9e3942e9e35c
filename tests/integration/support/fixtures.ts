/**
 * Test fixtures for the account and scenario tests: a throwaway team per test file (a lead, a designer, a viewer)
 * plus an outsider who leads another team, sealed session cookies for them, and Request builders.
 * The `server-only` marker of the modules it imports is aliased to its empty variant in vitest.config.ts.
 */
import { randomBytes } from "node:crypto";
import { sealData } from "iron-session";
import { db } from "@/lib/db/knex";
import { hashPassword } from "@/lib/auth/password";
import { SESSION_COOKIE, SESSION_TTL_S, sessionPassword } from "@/lib/auth/session-config";
import type { CurrentUser, Role } from "@/lib/shared/roles";
import { defaultScenario } from "@/lib/design/templates";
import type { Parts, Scenario } from "@/lib/design/schema";

/** A complete, valid scenario (the design layer's NPN-sink defaults) with some part values changed. */
export function scenarioBody(parts: Partial<Parts> = {}): Scenario {
  const s = defaultScenario("sink-npn");
  return { ...s, parts: { ...s.parts, ...parts } };
}

export const FIXTURE_PASSWORD = "fixture-password-123";

export interface Actor extends CurrentUser {
  sessionVersion: number;
}

export interface Fixture {
  tag: string;
  lead: Actor;
  designer: Actor;
  viewer: Actor;
  /** The lead of another team: must see nothing of this one. */
  outsider: Actor;
  scenarioId: string;
  revisionId: string;
}

let hashed: Promise<string> | undefined;

async function makeUser(tag: string, role: Role, team: { id: string; name: string }): Promise<Actor> {
  hashed ??= hashPassword(FIXTURE_PASSWORD);
  const email = `${role}.${tag}@fixture.test`;
  const name = `${role[0]!.toUpperCase()}${role.slice(1)} ${tag}`;
  const [u] = await db()("users").insert({ email, name, password_hash: await hashed, current_team_id: team.id }).returning("*");
  await db()("memberships").insert({ team_id: team.id, user_id: u.id, role });
  return { id: u.id, email, name, teamId: team.id, teamName: team.name, role, sessionVersion: u.session_version };
}

/** A new team with one member per role, an outsider team, and one scenario owned by the designer. */
export async function makeFixture(label: string): Promise<Fixture> {
  const tag = `${label}-${randomBytes(4).toString("hex")}`;
  const [team] = await db()("teams").insert({ name: `Fixture ${tag}` }).returning("*");
  const [other] = await db()("teams").insert({ name: `Other ${tag}` }).returning("*");
  const lead = await makeUser(tag, "lead", team);
  const designer = await makeUser(tag, "designer", team);
  const viewer = await makeUser(tag, "viewer", team);
  const outsider = await makeUser(`${tag}-out`, "lead", other);
  const [s] = await db()("scenarios")
    .insert({ team_id: team.id, owner_id: designer.id, title: `Bench sink ${tag}`, template: "sink-npn" })
    .returning("*");
  const [r] = await db()("revisions")
    .insert({
      scenario_id: s.id,
      number: 1,
      author_id: designer.id,
      note: "first",
      body: JSON.stringify(scenarioBody({ senseResistor: 1, baseResistor: 470 })),
    })
    .returning("*");
  await db()("scenarios").where({ id: s.id }).update({ current_revision_id: r.id });
  return { tag, lead, designer, viewer, outsider, scenarioId: s.id, revisionId: r.id };
}

/** A server-side session row for the user, as signing in makes one (table `sessions`). */
export async function sessionRowFor(userId: string): Promise<string> {
  const [r] = await db()("sessions").insert({ user_id: userId, expires_at: new Date(Date.now() + SESSION_TTL_S * 1000) }).returning("id");
  return String(r.id);
}

/** A Cookie header value holding a sealed session for the actor (with a live session row), as the browser would send it. */
export async function cookieFor(a: Actor | null): Promise<string | undefined> {
  if (!a) return undefined;
  const seal = await sealData({ userId: a.id, teamId: a.teamId, sv: a.sessionVersion, sid: await sessionRowFor(a.id) }, { password: sessionPassword(), ttl: SESSION_TTL_S });
  return `${SESSION_COOKIE}=${seal}`;
}

export const ORIGIN = "http://127.0.0.1:3999";

/** A Request for a route handler, with the actor's session cookie and a JSON body (or a raw one). */
export async function request(method: string, path: string, actor: Actor | null, body?: unknown, raw?: string): Promise<Request> {
  const headers: Record<string, string> = { host: "127.0.0.1:3999" };
  const cookie = await cookieFor(actor);
  if (cookie) headers.cookie = cookie;
  if (body !== undefined || raw !== undefined) headers["content-type"] = "application/json";
  return new Request(`${ORIGIN}${path}`, { method, headers, body: raw ?? (body === undefined ? undefined : JSON.stringify(body)) });
}

/** The second argument Next passes to a route handler. */
export function ctx<P extends object>(params: P): { params: Promise<P> } {
  return { params: Promise.resolve(params) };
}

/** Newest message in the mail fake's store for an address, waiting up to `ms` for it to arrive. */
export async function waitForMail(to: string, since: Date, ms = 10_000): Promise<{ subject: string; text_body: string } | undefined> {
  const end = Date.now() + ms;
  while (Date.now() < end) {
    const m = await db()("dev_mailbox")
      .where("to_address", "ilike", `%${to}%`)
      .where("received_at", ">=", since)
      .orderBy("id", "desc")
      .first();
    if (m) return m;
    await new Promise((r) => setTimeout(r, 100));
  }
  return undefined;
}

/** The first http(s) link in a text. */
export function firstLink(text: string): string | undefined {
  return text.match(/https?:\/\/\S+/)?.[0];
}

/** Closes the pool at the end of a file (vitest runs files one after another in fresh workers). */
export async function closeDb(): Promise<void> {
  await db().destroy();
  (globalThis as { quellKnex?: unknown }).quellKnex = undefined;
}
