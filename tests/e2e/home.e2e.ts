import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser } from "playwright-core";
import { BASE_URL, launch, watchErrors } from "./browser";

describe("home page", () => {
  let browser: Browser;
  beforeAll(async () => {
    browser = await launch();
  });
  afterAll(async () => {
    await browser?.close();
  });

  it("shows that the database and the mail fake are up", async () => {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await page.goto(BASE_URL, { waitUntil: "load" });
    const health = page.getByTestId("health");
    await health.getByText("System ok").waitFor({ timeout: 15_000 });
    expect(await health.textContent()).toContain("database up · mail up");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("answers /api/health with JSON", async () => {
    const r = await fetch(`${BASE_URL}/api/health`);
    expect(r.status).toBe(200);
    expect(await r.json()).toEqual({ status: "ok", database: "up", mail: "up" });
  });
});
