import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { launch, open, watchErrors } from "./browser";
import { demoUser, signIn } from "./auth";
import { db } from "@/lib/db/knex";

/**
 * Nothing lost, nothing hidden: the Save popover behaves as a dialog, unsaved edits survive leaving and reloading,
 * viewers are told what their edits are and what they may do, a new scenario's title is checked in the form, and
 * Share is in the workbench's header as a centred modal.
 */

/** WCAG 2.x relative luminance of an sRGB "rgb(r, g, b)" colour. */
function luminance(css: string): number {
  const [r, g, b] = (css.match(/[\d.]+/g) ?? []).slice(0, 3).map(Number).map((c) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!;
}
/** WCAG 2.x contrast ratio (common practice: ≥ 4.5:1 for normal text, success criterion 1.4.3). */
function contrast(a: string, b: string): number {
  const [hi, lo] = [luminance(a), luminance(b)].sort((x, y) => y - x);
  return (hi! + 0.05) / (lo! + 0.05);
}

describe("keeping work: save popover, kept drafts, viewers, new scenarios, sharing from the workbench", () => {
  let browser: Browser;
  let designer: BrowserContext;
  let scenarioId = "";

  /** A scenario of the designer's own (a copy of a demo revision), so no other test's revisions move. */
  async function ownCopy(title: string): Promise<string> {
    const me = await db()("users").where({ email: demoUser("designer").email }).first("id", "current_team_id");
    const src = await db()("scenarios as s").join("revisions as r", "r.id", "s.current_revision_id").where("s.title", "Valve coil driver").first("r.body");
    const [s] = await db()("scenarios").insert({ team_id: me.current_team_id, owner_id: me.id, title, template: "sink-npn" }).returning("id");
    const [r] = await db()("revisions").insert({ scenario_id: s.id, number: 1, author_id: me.id, note: "start", body: JSON.stringify(src.body) }).returning("id");
    await db()("scenarios").where({ id: s.id }).update({ current_revision_id: r.id });
    return s.id as string;
  }

  async function editComp(page: Page): Promise<{ before: string; next: string }> {
    const field = page.locator("#field-parts-compCapacitor");
    await field.waitFor();
    const before = await field.inputValue();
    const next = before === "2.2n" ? "3.3n" : "2.2n";
    await field.fill(next);
    await field.press("Enter");
    await expect.poll(() => page.getByTestId("dirty-indicator").textContent(), { timeout: 10_000 }).toContain("Unsaved changes");
    return { before, next };
  }

  beforeAll(async () => {
    browser = await launch();
    designer = await browser.newContext({ viewport: { width: 1280, height: 800 } });
    await signIn(await designer.newPage(), "designer");
    scenarioId = await ownCopy(`Kept drafts ${Date.now()}`);
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("the Save popover is a dialog: readable primary button, focus kept inside, Esc and a click outside close it", async () => {
    const page = await designer.newPage();
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("save-open").click();
    const popover = page.getByRole("dialog", { name: "Save revision" });
    await popover.waitFor();
    // The focus moved into the dialog.
    expect(await page.evaluate(() => !!document.activeElement?.closest('[role="dialog"]'))).toBe(true);
    const submit = page.getByTestId("save-submit");
    const { color, background } = await submit.evaluate((el) => ({ color: getComputedStyle(el).color, background: getComputedStyle(el).backgroundColor }));
    expect(contrast(color, background)).toBeGreaterThanOrEqual(4.5);
    // Tab cycles inside the dialog.
    for (let i = 0; i < 6; i++) {
      await page.keyboard.press("Tab");
      expect(await page.evaluate(() => !!document.activeElement?.closest('[role="dialog"]'))).toBe(true);
    }
    await page.keyboard.press("Escape");
    await popover.waitFor({ state: "detached" });
    expect(await page.evaluate(() => document.activeElement?.getAttribute("data-testid"))).toBe("save-open");
    await page.getByTestId("save-open").click();
    await popover.waitFor();
    await page.getByRole("region", { name: "Response" }).click({ position: { x: 5, y: 5 } });
    await popover.waitFor({ state: "detached" });
    await page.close();
  });

  it("unsaved edits survive a trip to the scenario list and a reload, with an offer to restore them", async () => {
    const page = await designer.newPage();
    const errors = watchErrors(page);
    await open(page, `/scenarios/${scenarioId}`);
    const { before, next } = await editComp(page);

    // Leaving through the top bar asks first; saying no stays with the edits.
    let asked = 0;
    let answer = false;
    page.on("dialog", (d) => {
      if (d.type() === "confirm") {
        asked++;
        void (answer ? d.accept() : d.dismiss());
      } else void d.accept();
    });
    await page.getByRole("banner").getByRole("link", { name: "Scenarios", exact: true }).click();
    await expect.poll(() => asked).toBe(1);
    expect(new URL(page.url()).pathname).toBe(`/scenarios/${scenarioId}`);
    answer = true;
    await page.getByRole("banner").getByRole("link", { name: "Scenarios", exact: true }).click();
    await page.waitForURL((u) => u.pathname === "/scenarios");
    expect(asked).toBe(2);

    // Back: the saved value shows, and the kept edits are offered.
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("draft-offer").waitFor();
    expect(await page.locator("#field-parts-compCapacitor").inputValue()).toBe(before);
    await page.getByTestId("draft-restore").click();
    await expect.poll(() => page.locator("#field-parts-compCapacitor").inputValue()).toBe(next);
    expect(await page.getByTestId("dirty-indicator").textContent()).toContain("Unsaved changes");

    // A reload keeps them too.
    await page.reload({ waitUntil: "load" });
    await page.getByTestId("draft-offer").waitFor();
    await page.getByTestId("draft-restore").click();
    await expect.poll(() => page.locator("#field-parts-compCapacitor").inputValue()).toBe(next);

    // Once saved, nothing is offered any more.
    await page.getByTestId("save-open").click();
    await page.getByTestId("save-submit").click();
    await page.getByText("Saved as revision 2").waitFor({ timeout: 15_000 });
    await open(page, `/scenarios/${scenarioId}`);
    await page.locator("#field-parts-compCapacitor").waitFor();
    expect(await page.locator("#field-parts-compCapacitor").inputValue()).toBe(next);
    expect(await page.getByTestId("draft-offer").count()).toBe(0);
    expect(errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
    await page.close();
  });

  it("a viewer's edits are a what-if that is not kept, with no fork or save offered", async () => {
    const ctx = await browser.newContext();
    const page = await ctx.newPage();
    await signIn(page, "viewer");
    await open(page, `/scenarios/${scenarioId}`);
    const field = page.locator("#field-parts-compCapacitor");
    await field.waitFor();
    await field.fill((await field.inputValue()) === "1n" ? "1.5n" : "1n");
    await field.press("Enter");
    await expect.poll(() => page.getByTestId("dirty-indicator").textContent()).toBe("What-if, not kept");
    expect(await page.getByText("Unsaved changes").count()).toBe(0);
    expect(await page.getByRole("button", { name: "Fork to my scenarios" }).count()).toBe(0);
    expect(await page.getByTestId("save-open").count()).toBe(0);

    // A new scenario: "Create and open" is disabled for a viewer, with the reason.
    await open(page, "/scenarios/new");
    const create = page.getByTestId("new-create");
    expect(await create.isDisabled()).toBe(true);
    const reasonId = await create.getAttribute("aria-describedby");
    expect(await page.locator(`#${reasonId}`).textContent()).toMatch(/Viewers cannot save scenarios/);
    await ctx.close();
  });

  it("designers may fork from the workbench's header", async () => {
    const page = await designer.newPage();
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByRole("button", { name: "Fork to my scenarios" }).click();
    await page.waitForURL((u) => /^\/scenarios\/[0-9a-f-]{36}$/.test(u.pathname) && u.pathname !== `/scenarios/${scenarioId}`, { timeout: 30_000 });
    await page.close();
  });

  it("a new scenario's empty title is refused in the form, in plain words, before anything is posted", async () => {
    const page = await designer.newPage();
    await open(page, "/scenarios/new");
    let posted = 0;
    page.on("request", (r) => {
      if (r.method() === "POST" && r.url().endsWith("/api/scenarios")) posted++;
    });
    await page.getByLabel("Title", { exact: true }).fill("   ");
    await page.getByTestId("new-create").click();
    const message = page.getByTestId("new-title-error");
    await message.waitFor();
    expect(await message.textContent()).toBe("Give the scenario a title.");
    expect(await page.getByLabel("Title", { exact: true }).getAttribute("aria-invalid")).toBe("true");
    expect(posted).toBe(0);
    await page.close();
  });

  it("Share is in the workbench's header and opens a centred modal", async () => {
    const page = await designer.newPage();
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByRole("button", { name: "Share link" }).click();
    const dialog = page.getByRole("dialog", { name: /Share revision/ });
    await dialog.waitFor();
    const box = (await dialog.boundingBox())!;
    const vp = page.viewportSize()!;
    expect(Math.abs(box.x + box.width / 2 - vp.width / 2)).toBeLessThan(4);
    expect(Math.abs(box.y + box.height / 2 - vp.height / 2)).toBeLessThan(4);
    expect(await page.getByLabel("Team link (members of your team, read-only)").inputValue()).toMatch(/\/share\/r\/[0-9a-f-]{36}$/);
    await page.keyboard.press("Escape");
    await dialog.waitFor({ state: "hidden" });
    await page.close();
  });
});
