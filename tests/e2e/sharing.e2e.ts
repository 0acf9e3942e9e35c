import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import type { Browser } from "playwright-core";
import { BASE_URL, launch, open, watchErrors } from "./browser";
import { signIn } from "./auth";
import { db } from "@/lib/db/knex";
import { hashToken } from "@/lib/shared/tokens";

/**
 * Sharing: a public link shows what a colleague needs (schematic, step response and loop gain simulated in the
 * visitor's browser, headline figures, checks), read-only, with "Open a copy" for signed-in designers; the team link
 * is built on the configured public base URL, not on whatever host the page was opened at.
 */
describe("sharing: the public page and the links' base URL", () => {
  let browser: Browser;
  let token = "";
  let scenarioId = "";

  beforeAll(async () => {
    browser = await launch();
    const s = await db()("scenarios").where({ title: "Valve coil driver" }).whereNull("deleted_at").first("id", "current_revision_id");
    scenarioId = s.id;
    token = randomBytes(32).toString("base64url");
    await db()("share_links").insert({ scenario_id: s.id, revision_id: s.current_revision_id, token_hash: hashToken(token), expires_at: new Date(Date.now() + 7 * 86400_000) });
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("a public link shows the schematic, both plots, the headline figures and the checks, simulated in the browser", async () => {
    const ctx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await ctx.newPage();
    const errors = watchErrors(page);
    let workerStarted = false;
    page.on("worker", () => (workerStarted = true));
    await open(page, `/share/p/${token}`);
    await page.locator('[data-testid="shared-revision"][data-sim-status="done"]').waitFor({ timeout: 90_000 });
    expect(workerStarted).toBe(true);
    expect(await page.getByTestId("shared-section-schematic").locator("svg").count()).toBeGreaterThan(0);
    await page.getByTestId("shared-step-plot").waitFor();
    await page.getByTestId("shared-loop-plot").waitFor();
    expect(await page.getByTestId("shared-phase-margin").textContent()).toMatch(/°|no crossover/);
    expect(await page.getByTestId("shared-overshoot").textContent()).toMatch(/%/);
    expect((await page.getByTestId("shared-section-checks").locator("tr").count())).toBeGreaterThan(2);
    // Read-only: no field to edit, and a way in for those with an account.
    expect(await page.locator("main input, main textarea, main select").count()).toBe(0);
    await page.getByRole("link", { name: "Sign in to open a copy" }).waitFor();
    expect(errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
    await ctx.close();
  });

  it("a signed-in designer opens a copy of a publicly shared revision", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signIn(page, "designer");
    await open(page, `/share/p/${token}`);
    await page.getByRole("button", { name: "Open a copy" }).click();
    await page.waitForURL((u) => /^\/scenarios\/[0-9a-f-]{36}$/.test(u.pathname) && u.pathname !== `/scenarios/${scenarioId}`, { timeout: 30_000 });
    expect(await page.getByTestId("scenario-title").textContent()).toBe("Valve coil driver (copy)");
    await ctx.close();
  });

  it("the team link starts with the configured public base URL, whatever host the page was opened at", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signIn(page, "designer");
    const other = BASE_URL.replace("127.0.0.1", "localhost");
    expect(other).not.toBe(BASE_URL);
    await ctx.addCookies((await ctx.cookies(BASE_URL)).map((c) => ({ name: c.name, value: c.value, url: other })));
    await open(page, `${other}/scenarios/${scenarioId}/history`);
    await page.getByRole("button", { name: "Share link" }).click();
    const link = await page.getByLabel("Team link (members of your team, read-only)").inputValue();
    // The test command starts the app without QUELL_PUBLIC_URL, so the base is QUELL_BASE_URL (lib/shared/tokens).
    expect(link.startsWith(`${BASE_URL}/share/r/`)).toBe(true);
    await ctx.close();
  });
});
