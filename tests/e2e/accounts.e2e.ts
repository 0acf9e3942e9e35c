import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { BASE_URL, launch, watchErrors, open, waitHydrated } from "./browser";
import { demoUser, signIn } from "./auth";
import { db } from "@/lib/db/knex";

/** A fresh browser context (its own cookies) with clipboard access for "Copy link". */
async function context(browser: Browser): Promise<BrowserContext> {
  const ctx = await browser.newContext();
  await ctx.grantPermissions(["clipboard-read", "clipboard-write"], { origin: BASE_URL });
  return ctx;
}

describe("accounts journey: save, share, open, comment", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("sends an anonymous visitor to sign-in and back", async () => {
    const ctx = await context(browser);
    const page = await ctx.newPage();
    await open(page, `${BASE_URL}/team`);
    expect(new URL(page.url()).pathname).toBe("/sign-in");
    expect(new URL(page.url()).searchParams.get("next")).toBe("/team");
    // A wrong password gets the generic refusal, in place.
    await page.getByLabel("E-mail").fill(demoUser("viewer").email);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("alert").getByText("do not match an account").waitFor();
    await ctx.close();
  });

  it("designer saves a revision with a note and copies its share link; the viewer opens it and comments", async () => {
    // Designer: create a scenario, save a tuned revision with a note.
    const designerCtx = await context(browser);
    const designer = await designerCtx.newPage();
    const errors = watchErrors(designer);
    await signIn(designer, "designer");
    const cookie = (await designerCtx.cookies()).find((c) => c.name === "quell_session");
    expect(cookie).toMatchObject({ httpOnly: true, sameSite: "Lax" });
    await designer.getByRole("heading", { name: "Scenarios" }).waitFor();
    await designer.getByLabel("Search titles").fill("Valve coil driver");
    await designer.getByRole("table").getByRole("link", { name: "Valve coil driver", exact: true }).waitFor();

    const title = `Coil driver, tuned ${Date.now()}`;
    await designer.getByLabel("Title", { exact: true }).fill(title);
    await designer.getByRole("button", { name: "Create" }).click();
    await designer.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/);
    const scenarioId = new URL(designer.url()).pathname.split("/")[2]!;

    // The workbench: tune the sense resistor, then save with a note.
    const sense = designer.getByLabel("Sense resistor", { exact: true });
    await sense.fill("470m");
    await sense.press("Enter");
    await designer.getByTestId("save-open").click();
    await designer.getByTestId("save-note").fill("Sense resistor to 0.47 Ω");
    await designer.getByTestId("save-submit").click();
    await designer.getByRole("status").getByText("Saved as revision 2").waitFor();

    await open(designer, `${BASE_URL}/scenarios/${scenarioId}/history`);
    // The history lists it with its note, and the diff shows the part values that changed.
    await designer.getByRole("cell", { name: "Sense resistor to 0.47 Ω" }).waitFor();
    const diff = designer.getByTestId("diff");
    await diff.getByText("Sense resistor", { exact: true }).waitFor();
    expect(await diff.textContent()).toContain("470 mΩ");

    // Copy link: the team link to this revision.
    await designer.getByRole("button", { name: "Share link" }).click();
    const linkField = designer.getByLabel("Team link (members of your team, read-only)");
    const link = await linkField.inputValue();
    expect(link).toMatch(new RegExp(`^${BASE_URL}/share/r/[0-9a-f-]{36}$`));
    await designer.getByRole("button", { name: "Copy link" }).click();
    await designer.getByText("Copied.").waitFor();
    expect(await designer.evaluate(() => navigator.clipboard.readText())).toBe(link);
    expect(errors).toEqual([]);
    await designerCtx.close();

    // Viewer: opens the link, sees the revision read-only, comments.
    const viewerCtx = await context(browser);
    const viewer = await viewerCtx.newPage();
    const viewerErrors = watchErrors(viewer);
    await signIn(viewer, "viewer");
    await open(viewer, link);
    await viewer.getByRole("heading", { name: new RegExp(`${title}.*revision 2`) }).waitFor();
    await viewer.getByText("“Sense resistor to 0.47 Ω”").waitFor();
    const parts = viewer.getByRole("region", { name: "Part values" });
    expect(await parts.textContent()).toContain("470 mΩ");
    // Read-only for a viewer: no fork, no save.
    expect(await viewer.getByRole("button", { name: "Fork to my drafts" }).count()).toBe(0);

    await viewer.getByLabel("Add a comment").fill("Checked the step response: no ringing at 40 mH.");
    await viewer.getByRole("button", { name: "Post comment" }).click();
    const comments = viewer.getByTestId("comments");
    await comments.getByText("Checked the step response: no ringing at 40 mH.").waitFor();
    expect(await comments.textContent()).toContain(demoUser("viewer").name);
    expect(await comments.textContent()).toContain("on revision 2");
    expect(viewerErrors).toEqual([]);
    await viewerCtx.close();
  });

  it("the revision form refuses a save on a stale revision and shows both versions", async () => {
    const designerCtx = await context(browser);
    const leadCtx = await context(browser);
    const designer = await designerCtx.newPage();
    const lead = await leadCtx.newPage();
    await signIn(designer, "designer");
    await signIn(lead, "lead");
    const title = `Cell-test spare ${Date.now()}`;
    await designer.getByLabel("Title", { exact: true }).fill(title);
    await designer.getByRole("button", { name: "Create" }).click();
    await designer.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/);
    const history = `${BASE_URL}/scenarios/${new URL(designer.url()).pathname.split("/")[2]}/history`;
    await open(designer, history);
    await open(lead, history);

    async function edit(page: Page, senseResistor: number, note: string) {
      const body = page.getByLabel("Scenario (JSON)");
      const s = JSON.parse(await body.inputValue()) as { parts: Record<string, number> };
      s.parts.senseResistor = senseResistor;
      await body.fill(JSON.stringify(s, null, 2));
      await page.getByLabel("Note").fill(note);
      await page.getByRole("button", { name: "Save revision" }).click();
    }
    await edit(designer, 0.33, "designer's change");
    await designer.getByText("Saved as revision 2.").waitFor();
    await edit(lead, 0.22, "lead's change, on a stale base");
    await lead.getByRole("alert").getByText(/Revision 2 was saved by Dev Okafor/).waitFor();
    const diff = lead.getByTestId("diff");
    await diff.getByText("Sense resistor", { exact: true }).waitFor();
    const row = await diff.getByRole("row", { name: /Sense resistor/ }).textContent();
    expect(row).toContain("330 mΩ"); // theirs (revision 2)
    expect(row).toContain("220 mΩ"); // mine
    // Nothing was overwritten: revision 2 is still the designer's.
    await lead.reload({ waitUntil: "load" });
    await lead.getByRole("cell", { name: "designer's change" }).waitFor();
    expect(await lead.getByRole("cell", { name: "lead's change, on a stale base" }).count()).toBe(0);

    // The designer sends it for review; the table's status filter finds it.
    const [patched] = await Promise.all([
      designer.waitForResponse((r) => r.request().method() === "PATCH" && r.url().includes("/api/scenarios/")),
      designer.getByLabel("Status").selectOption("review"),
    ]);
    expect(patched.status()).toBe(200);
    await open(designer, `${BASE_URL}/scenarios`);
    await designer.getByLabel("Status").selectOption("review");
    await designer.getByLabel("Search titles").fill(title);
    await designer.getByRole("table").getByRole("link", { name: title, exact: true }).waitFor();
    await expect.poll(() => designer.getByRole("table").locator("tbody tr").count(), { timeout: 10_000 }).toBe(1);
    expect(await designer.getByRole("table").locator("tbody tr").textContent()).toContain("review");
    await designerCtx.close();
    await leadCtx.close();
  });

  it("signs up a new team's lead, signs out, and resets the password through the e-mailed link", async () => {
    const ctx = await context(browser);
    const page = await ctx.newPage();
    const errors = watchErrors(page);
    const email = `ines.hart.${Date.now()}@marsh-works.test`;
    await open(page, `${BASE_URL}/sign-up`);
    await page.getByLabel("Your name").fill("Ines Hart");
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill("short");
    await page.getByLabel("Team name").fill("Marsh Works test bench");
    await page.getByRole("button", { name: "Create account and team" }).click();
    await page.getByText("Use at least 10 characters.").waitFor(); // the error in place, the rest kept
    expect(await page.getByLabel("E-mail").inputValue()).toBe(email);
    await page.getByLabel("Password").fill("ines-first-password");
    await page.getByRole("button", { name: "Create account and team" }).click();
    await page.waitForURL((u) => u.pathname === "/scenarios");
    expect(await page.getByTestId("who").textContent()).toContain("lead");

    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    await page.waitForURL((u) => u.pathname === "/sign-in");

    const since = new Date(Date.now() - 2000);
    await page.getByRole("link", { name: "Forgot your password?" }).click();
    await page.waitForURL((u) => u.pathname === "/forgot-password");
    await waitHydrated(page); // signing out may have loaded the sign-in page afresh: the link could be a full load
    await page.getByRole("heading", { name: "Reset your password" }).waitFor();
    await page.getByLabel("E-mail").fill(email);
    await page.getByRole("button", { name: "Send a reset link" }).click();
    await page.getByRole("status").getByText("If that address has an account").waitFor();

    // The mail fake stored the message; follow its link.
    let mail: { text_body: string } | undefined;
    for (let i = 0; i < 50 && !mail; i++) {
      mail = await db()("dev_mailbox").where({ to_address: email }).where("received_at", ">=", since).first();
      if (!mail) await new Promise((r) => setTimeout(r, 200));
    }
    const link = mail?.text_body.match(/https?:\/\/\S+\/reset-password\?token=\S+/)?.[0];
    expect(link).toBeTruthy();
    const local = link!.replace(/^https?:\/\/[^/]+/, BASE_URL);
    await open(page, local);
    await page.getByLabel("New password", { exact: true }).fill("ines-second-password");
    await page.getByLabel("New password again").fill("ines-second-password");
    await page.getByRole("button", { name: "Set the new password" }).click();
    await page.waitForURL((u) => u.pathname === "/scenarios");

    // Single use.
    await open(page, local);
    await page.getByText("This reset link has been used already.").waitFor();
    expect(errors).toEqual([]);
    await ctx.close();
  });

  it("lead invites by e-mail; the link from the development outbox creates an account in the team", async () => {
    const leadCtx = await context(browser);
    const lead = await leadCtx.newPage();
    await signIn(lead, "lead", "/team");
    const email = `new.member.${Date.now()}@kestrel-hollow.test`;
    await lead.getByLabel("E-mail").fill(email);
    await lead.getByLabel("Role", { exact: true }).selectOption("viewer");
    await lead.getByRole("button", { name: "Invite" }).click();
    await lead.getByText("Invitation sent.").waitFor();
    await lead.getByTestId("invitations").getByText(email).waitFor();

    await open(lead, `${BASE_URL}/dev/outbox`);
    const mail = lead.locator("li", { hasText: email }).first();
    await mail.waitFor();
    const text = (await mail.textContent()) ?? "";
    const link = text.match(/https?:\/\/\S+?\/invitations\/[A-Za-z0-9_-]+/)?.[0];
    expect(link).toBeTruthy();
    await leadCtx.close();

    const inviteeCtx = await context(browser);
    const invitee = await inviteeCtx.newPage();
    await open(invitee, link!.replace(/^https?:\/\/[^/]+/, BASE_URL));
    await invitee.getByRole("heading", { name: "Join Kestrel Hollow Instruments — bench group" }).waitFor();
    await invitee.getByLabel("Your name").fill("Nia Brook");
    await invitee.getByLabel("Password").fill("nia-brook-password");
    await invitee.getByRole("button", { name: "Create account and join" }).click();
    await invitee.waitForURL((u) => u.pathname === "/scenarios");
    expect(await invitee.getByTestId("who").textContent()).toContain("viewer");
    // The link is single-use.
    await open(invitee, link!.replace(/^https?:\/\/[^/]+/, BASE_URL));
    await invitee.getByText("This invitation has been used already.").waitFor();
    await inviteeCtx.close();
  });

  it("a public link opens without an account, and answers 404 once revoked", async () => {
    const ctx = await context(browser);
    const page = await ctx.newPage();
    await signIn(page, "designer");
    await page.getByLabel("Search titles").fill("Valve coil driver"); // other suites add scenarios: it may be past page 1
    await page.getByRole("table").getByRole("link", { name: "History of Valve coil driver", exact: true }).click();
    await page.waitForURL(/\/history$/);
    await page.getByRole("button", { name: "Share link" }).click();
    await page.getByLabel("Expires after").selectOption("7");
    await page.getByRole("button", { name: "Create public link" }).click();
    const url = await page.getByLabel("New public link (shown once: copy it now)").inputValue();
    expect(url).toMatch(/\/share\/p\/[A-Za-z0-9_-]{43}$/);

    const anon = await browser.newContext();
    const visitor = await anon.newPage();
    await open(visitor, url.replace(/^https?:\/\/[^/]+/, BASE_URL));
    await visitor.getByRole("heading", { name: /Valve coil driver/ }).waitFor();

    // Newest link first: revoke it and wait for the server to confirm.
    const [revoked] = await Promise.all([
      page.waitForResponse((r) => r.request().method() === "DELETE" && r.url().includes("/share-links?id=")),
      page.getByRole("button", { name: "Revoke" }).first().click(),
    ]);
    expect(revoked.status()).toBe(204);
    // A revoked link answers 404 (decided before the page streams), with a word on why.
    const gone = await visitor.reload({ waitUntil: "load" });
    expect(gone?.status()).toBe(404);
    await visitor.getByText("This link is not valid: it may have expired, or the people who shared it revoked it.").waitFor();
    await anon.close();
    await ctx.close();
  });
});
