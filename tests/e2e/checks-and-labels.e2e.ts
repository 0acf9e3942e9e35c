import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, open } from "./browser";
import { signIn } from "./auth";
import { db } from "@/lib/db/knex";

/** Inputs without a linked label (label[for], a wrapping label, aria-label or aria-labelledby), as "tag#id name". */
const UNLABELLED = `(() => [...document.querySelectorAll("main input:not([type=hidden]), main select, main textarea")]
  .filter((el) => !(el.labels && el.labels.length > 0) && !el.getAttribute("aria-label") && !el.getAttribute("aria-labelledby"))
  .map((el) => el.tagName.toLowerCase() + "#" + el.id + " " + (el.getAttribute("name") || "")))()`;

/**
 * Checks and labels: a margin reads as a margin with what it needs, and every input of the workbench (the op-amp and
 * pass-device panels included) has a linked label.
 */
describe("checks and labels", () => {
  let browser: Browser;
  let page: Page;
  let scenarioId = "";

  beforeAll(async () => {
    browser = await launch();
    page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    scenarioId = (await db()("scenarios").where({ title: "Valve coil driver" }).whereNull("deleted_at").first("id")).id;
    await signIn(page, "designer");
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("the common-mode check reads as a margin and what it needs", async () => {
    expect(await page.getByTestId("check-common-mode-value").textContent()).toMatch(/^margin /);
    expect(await page.getByTestId("check-common-mode-limit").textContent()).toMatch(/^needs ≥ /);
    expect(await page.getByTestId("check-compliance-limit").textContent()).toMatch(/^needs [≥≤] /);
  });

  it("every input of the workbench has a linked label, with every panel open", async () => {
    await page.evaluate(() => document.querySelectorAll("details").forEach((d) => ((d as HTMLDetailsElement).open = true)));
    await page.getByTestId("studies-toggle").click();
    expect(await page.evaluate(UNLABELLED)).toEqual([]);
    for (const tab of ["sweep", "map", "spread", "compensate"]) {
      await page.getByTestId(`studies-tab-${tab}`).click();
      expect(await page.evaluate(UNLABELLED.replaceAll("main ", ""))).toEqual([]);
    }
  });

  it("the op-amp and pass-device panels can be driven through their labels, each label naming one field", async () => {
    await page.getByLabel("Op-amp preset", { exact: true }).waitFor();
    await page.getByLabel("Pass-device preset", { exact: true }).waitFor();
    await page.getByLabel("Base–emitter capacitance Cje0", { exact: true }).waitFor();
    const names = await page.evaluate(() => [...document.querySelectorAll('section[aria-label="Circuit"] input, section[aria-label="Circuit"] select')]
      .map((el) => el.getAttribute("aria-label") ?? [...((el as HTMLInputElement).labels ?? [])].map((l) => l.textContent?.trim()).join(" ")));
    const twice = names.filter((n, i) => names.indexOf(n) !== i);
    expect(twice).toEqual([]);
  });
});
