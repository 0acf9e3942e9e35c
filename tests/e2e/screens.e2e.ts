import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, open } from "./browser";
import { signIn } from "./auth";
import { db } from "@/lib/db/knex";

/**
 * Every screen size: at 390 px (a phone) and 1024 px (a tablet) no main page scrolls sideways; at 390 px the top
 * bar collapses into a menu and the workbench stacks circuit → response → verdict with Studies reachable; at 1024 px
 * the verdict stays beside the plots or directly under them, headline cards included.
 */
describe("screen sizes", () => {
  let browser: Browser;
  let scenarioId = "";
  let libraryId = "";

  beforeAll(async () => {
    browser = await launch();
    scenarioId = (await db()("scenarios").where({ title: "Valve coil driver" }).whereNull("deleted_at").first("id")).id;
    libraryId = (await db()("library_entries").first("id"))?.id ?? "";
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  async function phone(width: number): Promise<{ ctx: BrowserContext; page: Page }> {
    const ctx = await browser.newContext({ viewport: { width, height: width < 500 ? 844 : 768 } });
    const page = await ctx.newPage();
    return { ctx, page };
  }

  const overflow = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);

  for (const width of [390, 1024]) {
    it(`no main page scrolls sideways at ${width} px`, async () => {
      const { ctx, page } = await phone(width);
      for (const path of ["/", "/sign-in", "/forgot-password"]) {
        await open(page, path);
        expect({ path, overflow: await overflow(page) }).toEqual({ path, overflow: 0 });
      }
      await signIn(page, "lead");
      const pages = ["/scenarios", "/scenarios/new", `/scenarios/${scenarioId}`, `/scenarios/${scenarioId}/history`, `/scenarios/${scenarioId}/review`, `/scenarios/${scenarioId}/traces`, "/library", "/team"];
      if (libraryId) pages.push(`/library/${libraryId}`);
      for (const path of pages) {
        await open(page, path);
        if (path === `/scenarios/${scenarioId}`) await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
        expect({ path, overflow: await overflow(page) }).toEqual({ path, overflow: 0 });
      }
      await ctx.close();
    });
  }

  it("at 390 px the top bar collapses into a menu that holds the places and the account", async () => {
    const { ctx, page } = await phone(390);
    await signIn(page, "designer");
    const bar = (await page.getByRole("banner").boundingBox())!;
    expect(bar.width).toBeLessThanOrEqual(390);
    expect(await page.getByRole("button", { name: "Sign out", exact: true }).isVisible()).toBe(false);
    await page.getByRole("button", { name: "Menu" }).click();
    await page.getByRole("button", { name: "Sign out", exact: true }).waitFor();
    const signOut = (await page.getByRole("button", { name: "Sign out", exact: true }).boundingBox())!;
    expect(signOut.x + signOut.width).toBeLessThanOrEqual(390);
    await page.getByRole("link", { name: "Library" }).click();
    await page.waitForURL((u) => u.pathname === "/library");
    await ctx.close();
  });

  it("at 390 px the workbench stacks circuit, response, verdict, and Studies can be opened", async () => {
    const { ctx, page } = await phone(390);
    await signIn(page, "designer");
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    const y = async (name: string) => (await page.getByRole("region", { name }).boundingBox())!.y;
    const [circuit, response, verdict] = [await y("Circuit"), await y("Response"), await y("Verdict")];
    expect(circuit).toBeLessThan(response);
    expect(response).toBeLessThan(verdict);
    await page.getByTestId("studies-toggle").click(); // fails if anything covers it
    await page.getByTestId("studies-tab-sweep").waitFor();
    expect(await overflow(page)).toBe(0);
    await ctx.close();
  });

  it("at 1024 px the verdict and its headline cards sit beside the plots or directly under them", async () => {
    const { ctx, page } = await phone(1024);
    await signIn(page, "designer");
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    const response = (await page.getByRole("region", { name: "Response" }).boundingBox())!;
    const verdict = (await page.getByRole("region", { name: "Verdict" }).boundingBox())!;
    const beside = verdict.x >= response.x + response.width - 1 && verdict.y < response.y + response.height;
    const under = verdict.y >= response.y + response.height - 1 && verdict.y - (response.y + response.height) < 40 && verdict.x <= response.x + 1;
    expect(beside || under).toBe(true);
    expect(await page.getByTestId("metric-phase-margin-value").isVisible()).toBe(true);
    await ctx.close();
  });
});
