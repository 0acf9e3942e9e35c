import { afterAll, beforeAll, describe, expect, it } from "vitest";

import { db } from "@/lib/db/knex";
import { signInWithPassword, signUp, requestPasswordReset, resetPassword, SIGN_IN_REFUSED, SIGN_IN_THROTTLED } from "@/lib/auth/accounts";
import { inviteMember } from "@/lib/auth/invitations";
import { acceptInvitation, changeRole, findInvitationByToken, listInvitations, listMembers, removeMember, revokeInvitation } from "@/lib/db/teams";
import { resolveCurrentUser, teamsOfUser } from "@/lib/db/users";
import { resetTokenState, MAX_RESETS_PER_HOUR } from "@/lib/db/passwordResets";
import { MAX_FAILURES_PER_ACCOUNT, MAX_FAILURES_PER_ADDRESS } from "@/lib/db/signInAttempts";
import { createInvitedAccount } from "@/lib/auth/accounts";
import { DomainError } from "@/lib/errors";
import { sessionFromCookieHeader } from "@/lib/auth/session-config";
import { closeDb, cookieFor, FIXTURE_PASSWORD, firstLink, makeFixture, waitForMail, type Fixture } from "./support/fixtures";

// The test command runs the SMTP fake (db/mail-fake.ts) on QUELL_SMTP_PORT, storing what arrives in dev_mailbox.
let f: Fixture;
beforeAll(async () => {
  f = await makeFixture("acct");
});
afterAll(closeDb);

async function refused(p: Promise<unknown>, status: number) {
  const e = await p.then(() => null, (x: unknown) => x);
  expect(e).toBeInstanceOf(DomainError);
  expect((e as DomainError).status).toBe(status);
}

const addr = () => `10.9.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}`;

describe("sign-in", () => {
  it("accepts the right password whatever the case of the address", async () => {
    const r = await signInWithPassword(f.designer.email.toUpperCase(), FIXTURE_PASSWORD, addr());
    expect(r.ok).toBe(true);
  });

  it("gives the same text for a wrong password and for an address without an account", async () => {
    const wrong = await signInWithPassword(f.viewer.email, "not-the-password", addr());
    const nobody = await signInWithPassword(`nobody.${f.tag}@fixture.test`, "whatever-123", addr());
    expect(wrong).toEqual({ ok: false, throttled: false, message: SIGN_IN_REFUSED });
    expect(nobody).toEqual(wrong);
  });

  it("throttles an account after repeated failures, even with the right password, from any address", async () => {
    const email = f.lead.email;
    for (let i = 0; i < MAX_FAILURES_PER_ACCOUNT; i++) await signInWithPassword(email, `wrong-${i}`, addr());
    const r = await signInWithPassword(email, FIXTURE_PASSWORD, addr());
    expect(r).toEqual({ ok: false, throttled: true, message: SIGN_IN_THROTTLED });
    // The count lives in PostgreSQL: rows, not process memory.
    const rows = await db()("sign_in_attempts").where({ account: email.toLowerCase(), succeeded: false });
    expect(rows.length).toBeGreaterThanOrEqual(MAX_FAILURES_PER_ACCOUNT);
  });

  it("throttles an address after repeated failures across different accounts", async () => {
    const from = addr();
    for (let i = 0; i < MAX_FAILURES_PER_ADDRESS; i++) await signInWithPassword(`spray${i}.${f.tag}@fixture.test`, "x-wrong-123", from);
    const r = await signInWithPassword(f.viewer.email, FIXTURE_PASSWORD, from);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.throttled).toBe(true);
    expect((await signInWithPassword(f.viewer.email, FIXTURE_PASSWORD, addr())).ok).toBe(true);
  });
});

describe("sign-up", () => {
  it("makes the first user of a new team its lead", async () => {
    const { user, teamId } = await signUp({ name: "Ada Winter", email: `ada.${f.tag}@fixture.test`, password: "a-long-password", teamName: `Winter lab ${f.tag}` });
    const cu = await resolveCurrentUser(user.id, teamId);
    expect(cu?.role).toBe("lead");
    expect(cu?.teamName).toBe(`Winter lab ${f.tag}`);
    const stored = await db()("users").where({ id: user.id }).first();
    expect(stored.password_hash).toMatch(/^\$2[aby]\$10\$/);
    await refused(signUp({ name: "Again", email: `ADA.${f.tag}@fixture.test`, password: "a-long-password", teamName: "x team" }), 409);
  });
});

describe("password reset by e-mail", () => {
  it("mails a single-use link that sets a new password and ends older sessions", async () => {
    const since = new Date(Date.now() - 1000);
    const [u] = await db()("users").insert({ email: `reset.${f.tag}@fixture.test`, name: "Reset Me", password_hash: "x" }).returning("*");
    expect(await requestPasswordReset(u.email)).toBe(true);
    const mail = await waitForMail(u.email, since);
    expect(mail?.subject).toBe("Reset your Quell password");
    const link = firstLink(mail!.text_body)!;
    const url = new URL(link);
    expect(url.pathname).toBe("/reset-password");
    const token = url.searchParams.get("token")!;
    expect(await resetTokenState(token)).toBe("valid");
    const stored = await db()("password_resets").where({ user_id: u.id }).first();
    expect(stored.token_hash).not.toBe(token);

    const oldCookie = await cookieFor({ id: u.id, email: u.email, name: u.name, teamId: "", teamName: "", role: "viewer", sessionVersion: u.session_version });
    const { sessionVersion } = await resetPassword(token, "brand-new-password");
    expect(sessionVersion).toBe(u.session_version + 1);
    expect((await sessionFromCookieHeader(oldCookie!)).sv).toBe(u.session_version); // the old seal still opens…
    expect(await resolveCurrentUser(u.id, undefined, u.session_version)).toBeNull(); // …but no longer signs anyone in
    expect((await signInWithPassword(u.email, "brand-new-password", addr())).ok).toBe(true);
    expect(await resetTokenState(token)).toBe("used");
    await refused(resetPassword(token, "another-password"), 410);
  });

  it("refuses an expired link", async () => {
    const [u] = await db()("users").insert({ email: `exp.${f.tag}@fixture.test`, name: "Expired", password_hash: "x" }).returning("*");
    const since = new Date(Date.now() - 1000);
    await requestPasswordReset(u.email);
    const token = new URL(firstLink((await waitForMail(u.email, since))!.text_body)!).searchParams.get("token")!;
    await db()("password_resets").where({ user_id: u.id }).update({ expires_at: new Date(Date.now() - 1000) });
    expect(await resetTokenState(token)).toBe("expired");
    await refused(resetPassword(token, "whatever-password"), 410);
  });

  it("stops mailing one account after a few requests an hour", async () => {
    const [u] = await db()("users").insert({ email: `flood.${f.tag}@fixture.test`, name: "Flood", password_hash: "x" }).returning("*");
    const sent: boolean[] = [];
    for (let i = 0; i < MAX_RESETS_PER_HOUR + 1; i++) sent.push(await requestPasswordReset(u.email));
    expect(sent).toEqual([...Array(MAX_RESETS_PER_HOUR).fill(true), false]);
  });

  it("sends nothing for an address without an account (and says the same to the caller)", async () => {
    const to = `ghost.${f.tag}@fixture.test`;
    expect(await requestPasswordReset(to)).toBe(false);
    expect(await waitForMail(to, new Date(Date.now() - 1000), 500)).toBeUndefined();
  });
});

describe("teams: invitations, roles, members, several teams", () => {
  it("mails an expiring invitation whose link adds the invitee in the given role", async () => {
    const to = `newcomer.${f.tag}@fixture.test`;
    const since = new Date(Date.now() - 1000);
    const { invitation, mailSent } = await inviteMember(f.lead, to, "designer");
    expect(mailSent).toBe(true);
    expect(invitation.status).toBe("pending");
    const mail = await waitForMail(to, since);
    expect(mail?.subject).toBe(`Join ${f.lead.teamName} on Quell`);
    const url = new URL(firstLink(mail!.text_body)!);
    expect(url.pathname).toMatch(/^\/invitations\/[A-Za-z0-9_-]{43}$/);
    const token = decodeURIComponent(url.pathname.split("/").pop()!);
    const found = await findInvitationByToken(token);
    expect(found).toMatchObject({ teamId: f.lead.teamId, role: "designer", status: "pending" });

    const user = await createInvitedAccount({ name: "New Comer", email: to, password: "newcomer-password" });
    await acceptInvitation(token, user.id);
    const cu = await resolveCurrentUser(user.id, f.lead.teamId);
    expect(cu?.role).toBe("designer");
    await refused(acceptInvitation(token, user.id), 410); // single use
  });

  it("refuses an invitation for another address, an expired one and a revoked one", async () => {
    const { token } = await (await import("@/lib/db/teams")).createInvitation(f.lead, `someone.${f.tag}@fixture.test`, "viewer");
    await refused(acceptInvitation(token, f.outsider.id), 403);
    await db()("invitations").where({ email: `someone.${f.tag}@fixture.test` }).update({ expires_at: new Date(Date.now() - 1) });
    expect((await findInvitationByToken(token))?.status).toBe("expired");
    const again = await (await import("@/lib/db/teams")).createInvitation(f.lead, `someone2.${f.tag}@fixture.test`, "viewer");
    await revokeInvitation(f.lead, again.invitation.id);
    expect((await findInvitationByToken(again.token))?.status).toBe("revoked");
    expect((await listInvitations(f.lead.teamId)).some((i) => i.status === "revoked")).toBe(true);
    await refused(revokeInvitation(f.designer, again.invitation.id), 403);
  });

  it("lets a user belong to several teams and pick between them", async () => {
    const { token } = await (await import("@/lib/db/teams")).createInvitation(f.lead, f.outsider.email, "viewer");
    await acceptInvitation(token, f.outsider.id);
    const teams = await teamsOfUser(f.outsider.id);
    expect(teams.map((t) => t.teamId).sort()).toEqual([f.lead.teamId, f.outsider.teamId].sort());
    expect((await resolveCurrentUser(f.outsider.id, f.lead.teamId))?.role).toBe("viewer");
    expect((await resolveCurrentUser(f.outsider.id, f.outsider.teamId))?.role).toBe("lead");
    await removeMember(f.lead, f.outsider.id);
    // Removed from the chosen team: falls back to a team they still belong to.
    expect((await resolveCurrentUser(f.outsider.id, f.lead.teamId))?.teamId).toBe(f.outsider.teamId);
  });

  it("changes roles and keeps at least one lead", async () => {
    const m = await changeRole(f.lead, f.viewer.id, "designer");
    expect(m.role).toBe("designer");
    await changeRole(f.lead, f.viewer.id, "viewer");
    await refused(changeRole(f.lead, f.lead.id, "designer"), 409);
    await refused(removeMember(f.lead, f.lead.id), 409);
    await refused(changeRole(f.designer, f.viewer.id, "lead"), 403);
    await refused(changeRole(f.outsider, f.viewer.id, "lead"), 404);
    const roles = (await listMembers(f.lead.teamId)).filter((x) => [f.lead.id, f.designer.id, f.viewer.id].includes(x.userId)).map((x) => x.role).sort();
    expect(roles).toEqual(["designer", "lead", "viewer"]);
  });
});
