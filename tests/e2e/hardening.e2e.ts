import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createHash, randomBytes } from "node:crypto";
import type { Browser, BrowserContext } from "playwright-core";
import { BASE_URL, launch, open } from "./browser";
import { demoUser, signIn } from "./auth";
import { db } from "@/lib/db/knex";

/**
 * HTTP-level answers of the production server: statuses decided before a page streams, cross-origin posts, and
 * "Sign out everywhere" in the account menu. Plain fetch with redirect: "manual", so the first status is what is seen.
 */
describe("hardening: statuses before streaming, cross-origin posts, sessions", () => {
  let browser: Browser;
  let designer: BrowserContext;
  let designerCookie = "";
  let ownScenario = "";
  let otherTeamScenario = "";
  const tokens = { active: "", revoked: "", expired: "" };

  async function cookieHeader(ctx: BrowserContext): Promise<string> {
    return (await ctx.cookies(BASE_URL)).map((c) => `${c.name}=${c.value}`).join("; ");
  }

  beforeAll(async () => {
    browser = await launch();
    designer = await browser.newContext();
    await signIn(await designer.newPage(), "designer");
    designerCookie = await cookieHeader(designer);
    const me = await db()("users").where({ email: demoUser("designer").email }).first("id", "current_team_id");
    ownScenario = (await db()("scenarios").where({ team_id: me.current_team_id }).whereNull("deleted_at").whereNotNull("current_revision_id").first("id", "current_revision_id")).id;
    const revision = (await db()("scenarios").where({ id: ownScenario }).first("current_revision_id")).current_revision_id;
    const tag = randomBytes(4).toString("hex");
    const [team] = await db()("teams").insert({ name: `Elsewhere ${tag}` }).returning("id");
    const [owner] = await db()("users").insert({ email: `owner.${tag}@elsewhere.test`, name: "Owner elsewhere", password_hash: "x", current_team_id: team.id }).returning("id");
    await db()("memberships").insert({ team_id: team.id, user_id: owner.id, role: "lead" });
    const [s] = await db()("scenarios").insert({ team_id: team.id, owner_id: owner.id, title: `Not yours ${tag}`, template: "sink-npn" }).returning("id");
    otherTeamScenario = s.id;
    const hash = (t: string) => createHash("sha256").update(t, "utf8").digest("hex");
    for (const k of ["active", "revoked", "expired"] as const) {
      tokens[k] = randomBytes(32).toString("base64url");
      await db()("share_links").insert({
        scenario_id: ownScenario,
        revision_id: revision,
        token_hash: hash(tokens[k]),
        expires_at: new Date(Date.now() + (k === "expired" ? -1 : 1) * 86400_000),
        revoked_at: k === "revoked" ? new Date() : null,
      });
    }
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  const get = (path: string, cookie?: string) => fetch(`${BASE_URL}${path}`, { redirect: "manual", headers: cookie ? { cookie } : {} });

  it("anonymous visits to a scenario's pages redirect to sign-in (no 200 with the sign-in streamed inside)", async () => {
    for (const sub of ["", "/history", "/review", "/traces"]) {
      const r = await get(`/scenarios/${ownScenario}${sub}`);
      expect(r.status, sub || "workbench").toBe(307);
      expect(new URL(r.headers.get("location")!, BASE_URL).pathname).toBe("/sign-in");
    }
  });

  it("another team's scenario pages answer 404; one's own answer 200", async () => {
    for (const sub of ["", "/history", "/review", "/traces"]) {
      expect((await get(`/scenarios/${otherTeamScenario}${sub}`, designerCookie)).status, sub || "workbench").toBe(404);
      expect((await get(`/scenarios/${ownScenario}${sub}`, designerCookie)).status, sub || "workbench").toBe(200);
    }
    expect((await get("/scenarios/not-an-id/history", designerCookie)).status).toBe(404);
    // A deleted scenario of one's own team: its history still opens (to restore it), its workbench does not.
    const me = await db()("users").where({ email: demoUser("designer").email }).first("id", "current_team_id");
    const [gone] = await db()("scenarios").insert({ team_id: me.current_team_id, owner_id: me.id, title: "Deleted one", template: "sink-npn", deleted_at: new Date() }).returning("id");
    expect((await get(`/scenarios/${gone.id}`, designerCookie)).status).toBe(404);
    expect((await get(`/scenarios/${gone.id}/history`, designerCookie)).status).toBe(200);
  });

  it("unknown, revoked and expired public links answer 404; an active one 200", async () => {
    expect((await get(`/share/p/${tokens.active}`)).status).toBe(200);
    for (const t of ["no-such-token", tokens.revoked, tokens.expired]) expect((await get(`/share/p/${t}`)).status).toBe(404);
  });

  it("a cross-origin server-action call and a cross-origin sign-in form post answer 403 with a plain message", async () => {
    const action = await fetch(`${BASE_URL}/sign-in`, {
      method: "POST",
      redirect: "manual",
      headers: { origin: "http://evil.example", "next-action": "0".repeat(42), "content-type": "text/plain;charset=UTF-8" },
      body: "[]",
    });
    expect(action.status).toBe(403);
    expect(await action.text()).toMatch(/^Cross-origin request refused/);
    const fd = new FormData();
    fd.set("email", demoUser("viewer").email);
    fd.set("password", "wrong");
    const formPost = await fetch(`${BASE_URL}/sign-in`, { method: "POST", redirect: "manual", headers: { origin: "https://evil.example" }, body: fd });
    expect(formPost.status).toBe(403);
    expect(formPost.headers.get("content-type")).toMatch(/^text\/plain/);
  });

  it("a save that meets a database outage keeps the unsaved edits and offers to try again", async () => {
    // A scenario of the designer's own (a copy of a demo revision), so no other test's revisions move.
    const me = await db()("users").where({ email: demoUser("designer").email }).first("id", "current_team_id");
    const src = await db()("revisions").where({ scenario_id: ownScenario }).orderBy("number", "desc").first("body");
    const [s] = await db()("scenarios").insert({ team_id: me.current_team_id, owner_id: me.id, title: "Outage save target", template: "sink-npn" }).returning("id");
    const [r] = await db()("revisions").insert({ scenario_id: s.id, number: 1, author_id: me.id, note: "start", body: JSON.stringify(src.body) }).returning("id");
    await db()("scenarios").where({ id: s.id }).update({ current_revision_id: r.id });

    const page = await designer.newPage();
    await open(page, `/scenarios/${s.id}`);
    const field = page.locator("#field-parts-compCapacitor");
    await field.waitFor();
    const next = (await field.inputValue()) === "2.2n" ? "3.3n" : "2.2n";
    await field.fill(next);
    await field.press("Enter");
    await expect.poll(() => page.getByTestId("dirty-indicator").textContent(), { timeout: 10_000 }).toContain("Unsaved changes");

    // What the proxy answers while PostgreSQL is down: 503 with Retry-After, for the server action's POST.
    await page.route(`**/scenarios/${s.id}`, (route) =>
      route.request().method() === "POST"
        ? route.fulfill({ status: 503, headers: { "retry-after": "5", "content-type": "text/html" }, body: "The database is unavailable, try again." })
        : route.continue(),
    );
    await page.getByTestId("save-open").click();
    await page.getByTestId("save-note").fill("during the outage");
    await page.getByTestId("save-submit").click();
    await page.getByTestId("save-retry").waitFor({ timeout: 15_000 });
    expect(await page.getByTestId("save-message").textContent()).toMatch(/edits are kept/);
    expect(await page.getByTestId("dirty-indicator").textContent()).toContain("Unsaved changes");
    expect(await field.inputValue()).toBe(next);
    expect(await db()("revisions").where({ scenario_id: s.id }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: "1" }]);

    // The database is back: the same save goes through.
    await page.unroute(`**/scenarios/${s.id}`);
    await page.getByTestId("save-retry").click();
    await page.getByText("Saved as revision 2").waitFor({ timeout: 15_000 });
    const saved = await db()("revisions").where({ scenario_id: s.id, number: 2 }).first("note");
    expect(saved).toEqual({ note: "during the outage" });
    await page.close();
  });

  it("a client-sent X-Forwarded-For does not dodge the per-address sign-in limit (the socket's address counts)", async () => {
    // 20 failures already counted against this machine's socket address (127.0.0.1, where the test server listens).
    const account = `nobody.${randomBytes(3).toString("hex")}@elsewhere.test`;
    const rows = Array.from({ length: 20 }, () => ({ account, client_address: "127.0.0.1", succeeded: false }));
    const ids = (await db()("sign_in_attempts").insert(rows).returning("id")).map((r: { id: string }) => r.id);
    const forged = `10.${randomBytes(3).join(".")}`; // a fresh address each run, as a rotating client would send
    const ctx = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": forged } });
    try {
      const page = await ctx.newPage();
      await open(page, "/sign-in?next=/scenarios");
      await page.getByLabel("E-mail").fill(demoUser("viewer").email);
      await page.getByLabel("Password").fill(demoUser("viewer").password);
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.getByText("Too many failed sign-ins").waitFor({ timeout: 15_000 });
      expect(new URL(page.url()).pathname).toBe("/sign-in");
      expect(await db()("sign_in_attempts").where({ client_address: forged }).count<{ n: string }[]>({ n: "*" })).toEqual([{ n: "0" }]);
    } finally {
      await ctx.close();
      // Later suites sign in from this address too.
      await db()("sign_in_attempts").whereIn("id", ids).delete();
      await db()("sign_in_attempts").where({ client_address: "127.0.0.1", succeeded: false }).delete();
    }
  });

  it("Sign out ends the session on the server; Sign out everywhere (account menu) ends the user's other sessions", async () => {
    const members = (cookie: string) => fetch(`${BASE_URL}/api/team/members`, { headers: { cookie } }).then((r) => r.status);
    const laptop = await browser.newContext();
    const phone = await browser.newContext();
    const third = await browser.newContext();
    try {
      const laptopPage = await laptop.newPage();
      await signIn(laptopPage, "viewer");
      await signIn(await phone.newPage(), "viewer");
      const thirdPage = await third.newPage();
      await signIn(thirdPage, "viewer");
      const [laptopCookie, phoneCookie, thirdCookie] = [await cookieHeader(laptop), await cookieHeader(phone), await cookieHeader(third)];
      expect([await members(laptopCookie), await members(phoneCookie), await members(thirdCookie)]).toEqual([200, 200, 200]);

      // Plain sign-out from the top bar: a copy of that browser's cookie stops working, the others go on.
      await open(thirdPage, "/scenarios");
      await thirdPage.getByRole("button", { name: "Sign out", exact: true }).click();
      await thirdPage.waitForURL((u) => u.pathname === "/sign-in");
      expect([await members(thirdCookie), await members(phoneCookie)]).toEqual([401, 200]);

      await open(laptopPage, "/scenarios");
      await laptopPage.getByRole("button", { name: "Sign out everywhere" }).click();
      await laptopPage.waitForURL((u) => u.pathname === "/sign-in");
      expect([await members(laptopCookie), await members(phoneCookie), await members(designerCookie)]).toEqual([401, 401, 200]);
    } finally {
      await Promise.all([laptop.close(), phone.close(), third.close()]);
    }
  });
});
