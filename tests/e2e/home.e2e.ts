import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, launch, watchErrors, open } from "./browser";
import { signIn } from "./auth";

describe("home page", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("says what Quell does with a picture of the workbench, offers Create a team beside Sign in, and shows no system status", async () => {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await open(page, BASE_URL);
    const picture = page.getByRole("img", { name: /The Quell workbench/ });
    await picture.waitFor();
    await expect.poll(() => picture.evaluate((img) => (img as HTMLImageElement).complete && (img as HTMLImageElement).naturalWidth), { timeout: 15_000 }).toBeGreaterThan(1000);
    const main = page.getByRole("main");
    expect(await main.getByRole("link", { name: "Create a team" }).getAttribute("href")).toBe("/sign-up");
    expect(await main.getByRole("link", { name: "Sign in" }).getAttribute("href")).toBe("/sign-in");
    expect(await page.getByTestId("health").count()).toBe(0);
    expect(await main.textContent()).not.toMatch(/database up|System ok/);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("a signed-in user who opens the sign-in or forgot-password page goes to their scenarios", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signIn(page, "designer");
    for (const path of ["/sign-in", "/forgot-password"]) {
      await open(page, `${BASE_URL}${path}`);
      expect(new URL(page.url()).pathname).toBe("/scenarios");
    }
    await ctx.close();
  });

  it("answers /api/health with JSON", async () => {
    const r = await fetch(`${BASE_URL}/api/health`);
    expect(r.status).toBe(200);
    expect(await r.json()).toEqual({ status: "ok", database: "up", mail: "up" });
  });
});
