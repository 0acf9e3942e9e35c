import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { BASE_URL, launch, open } from "./browser";
import { signIn } from "./auth";
import { db } from "@/lib/db/knex";

/** One date format everywhere, and plain words instead of codes and ids. */
const ONE_FORMAT = /\b\d{1,2} (Jan|Feb|Mar|Apr|May|Jun|Jul|Aug|Sep|Oct|Nov|Dec) \d{4}(, \d{2}:\d{2} UTC)?/;
const OTHER_FORMATS = [/\b\d{1,2}\/\d{1,2}\/\d{4}\b/, /\bGMT\b/, /\b\d{4}-\d{2}-\d{2}\b/, /\b(Mon|Tue|Wed|Thu|Fri|Sat|Sun), \d{2} /];

describe("dates and words", () => {
  let browser: Browser;
  let page: Page;
  let scenarioId = "";

  beforeAll(async () => {
    browser = await launch();
    page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    scenarioId = (await db()("scenarios").where({ title: "Valve coil driver" }).whereNull("deleted_at").first("id")).id;
    await signIn(page, "lead");
    // Something for the activity feed that used to show as a raw code: a public link made and revoked.
    const revisionId = (await db()("scenarios").where({ id: scenarioId }).first("current_revision_id")).current_revision_id;
    const made = await page.evaluate(async ([id, rev]) => {
      const r = await fetch(`/api/scenarios/${id}/share-links`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ revisionId: rev, days: 1 }) });
      return (await r.json()) as { link: { id: string } };
    }, [scenarioId, revisionId] as const);
    await page.evaluate(async ([id, link]) => { await fetch(`/api/scenarios/${id}/share-links?id=${link}`, { method: "DELETE" }); }, [scenarioId, made.link.id] as const);
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("dates read one way on the team, history, review, library and share pages", async () => {
    const seen: string[] = [];
    for (const path of ["/team", `/scenarios/${scenarioId}/history`, `/scenarios/${scenarioId}/review`, "/library"]) {
      await open(page, path);
      if (path.endsWith("/history")) await page.getByRole("table").first().waitFor();
      if (path.endsWith("/review")) await page.locator('[data-testid="review-document"][data-sim-status="done"]').waitFor({ timeout: 90_000 });
      const text = (await page.locator("body").innerText()) + " " + (await page.locator("body [title]").evaluateAll((els) => els.map((e) => e.getAttribute("title")).join(" ")));
      for (const f of OTHER_FORMATS) expect({ path, other: f.exec(text)?.[0] ?? null }).toEqual({ path, other: null });
      if (ONE_FORMAT.test(text)) seen.push(path);
    }
    expect(seen).toEqual(expect.arrayContaining(["/team", `/scenarios/${scenarioId}/history`, `/scenarios/${scenarioId}/review`]));
  });

  it("the activity feed has no raw event codes", async () => {
    await open(page, "/team");
    const feed = await page.getByRole("region", { name: "Recent activity" }).innerText();
    expect(feed).toMatch(/made a public share link/);
    expect(feed).toMatch(/revoked a public share link/);
    expect(feed).not.toMatch(/\b[a-z]+(_[a-z]+)*\.[a-z_]+\b/);
  });

  it("the library's filter menus show readable names, not internal ids", async () => {
    await open(page, `${BASE_URL}/library`);
    const options = await page.locator('form[role="search"] select option').allTextContents();
    for (const id of ["sink-npn", "sink-nmos", "coil", "npn", "nmos", "resistor", "led"]) expect(options).not.toContain(id);
    expect(options).toEqual(expect.arrayContaining(["Validated"]));
  });
});
