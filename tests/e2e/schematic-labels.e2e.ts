import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Page } from "playwright-core";
import { launch, open, watchErrors } from "./browser";
import { signIn } from "./auth";
import { OVERLAP_TOLERANCE, schematicOverlaps } from "./schematic-geometry";
import { SCHEMATIC_CASES } from "./schematic-cases";
import { defaultScenario } from "@/lib/design";
import type { Scenario } from "@/lib/design/schema";

/**
 * The schematic's labels keep clear of each other, of the wires and of the symbols, in every template and with every
 * optional network fitted, before a run and with the operating point drawn over it. Measured in Chromium on the
 * rendered SVG (tests/e2e/schematic-geometry.ts says how, and why the tolerance is OVERLAP_TOLERANCE = 0.5 viewBox
 * units). The scenarios are made through the API as the designer, opened in the workbench, and deleted afterwards
 * (other suites look for the demo scenarios on the first page of the list).
 */
describe("schematic labels", () => {
  let browser: Browser;
  let page: Page;
  let errors: string[];
  const created: string[] = [];

  beforeAll(async () => {
    browser = await launch();
    page = await browser.newPage({ viewport: { width: 1440, height: 900 } });
    errors = watchErrors(page);
    await signIn(page, "designer");
  });

  afterAll(async () => {
    if (page) {
      const statuses = await page.evaluate(async (ids) => {
        const out: number[] = [];
        for (const id of ids) out.push((await fetch(`/api/scenarios/${id}`, { method: "DELETE" })).status);
        return out;
      }, created);
      expect(statuses.filter((st) => st !== 204)).toEqual([]);
    }
    await browser?.close();
  });

  const overlaps = async () => {
    await page.evaluate(() => document.fonts.ready);
    return page.evaluate(schematicOverlaps, { selector: '[data-testid="schematic"]', tolerance: OVERLAP_TOLERANCE });
  };

  it("the check sees a collision: a value moved onto its resistor, and onto another value, is reported by its text", async () => {
    const id = await create("Label check of the check", defaultScenario("sink-npn"));
    await open(page, `/scenarios/${id}`);
    await page.getByTestId("schematic").waitFor();
    expect(await overlaps()).toEqual([]);
    // the sense resistor's value across its own body
    const sense = await page.getByTestId("schematic-senseResistor").locator("text").first().evaluate((t) => {
      const lead = t.closest("[data-part]")!.querySelector('[data-symbol="resistor"] line')!;
      t.setAttribute("x", String(Number(lead.getAttribute("x1")) - 8));
      return t.textContent;
    });
    // the compensation capacitor's value onto the feedback resistor's
    const [comp, feedback] = await page.evaluate(() => {
      const rf = document.querySelector('[data-part="feedbackResistor"] text')!;
      const cc = document.querySelector('[data-part="compCapacitor"] text')!;
      cc.setAttribute("x", rf.getAttribute("x")!);
      cc.setAttribute("y", String(Number(rf.getAttribute("y")) - 4));
      return [cc.textContent, rf.textContent];
    });
    const found = (await overlaps()).join("\n");
    expect(found).toContain(`"${sense}" of senseResistor is crossed by the resistor (rect) of senseResistor`);
    // (pairs are named in document order: the feedback resistor is drawn first)
    expect(found).toContain(`"${feedback}" of feedbackResistor overlaps the text "${comp}" of compCapacitor`);
  });

  for (const { name, scenario } of SCHEMATIC_CASES) {
    it(`${name}: no label overlaps a label, a wire or a symbol, before a run and with the operating point shown`, async () => {
      const id = await create(`Label check: ${name}`, scenario);
      await open(page, `/scenarios/${id}`);
      await page.getByTestId("schematic").waitFor();
      const withoutOp = await overlaps();

      await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
      await page.getByTestId("toggle-op").check();
      // the node voltages drawn on the schematic (the summary line under it is empty for the Howland pump)
      await page.getByTestId("schematic").getByTestId("op-tag").first().waitFor();
      expect(await page.getByTestId("schematic").getByTestId("op-tag").count()).toBeGreaterThanOrEqual(3);
      const withOp = await overlaps();
      // both states in one assertion, so a failure lists every collision of the case
      expect({ "without the operating point": withoutOp, "with the operating point": withOp }, name).toEqual({
        "without the operating point": [],
        "with the operating point": [],
      });
      expect(errors).toEqual([]);
    });
  }

  /** Makes a scenario through the API as the signed-in designer; returns its id (deleted after the suite). */
  async function create(title: string, body: Scenario): Promise<string> {
    const id = await page.evaluate(async ({ title, body }) => {
      const r = await fetch("/api/scenarios", {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ title: `${title} ${Date.now()}`, template: body.template, body }),
      });
      if (r.status !== 201) throw new Error(`creating "${title}": ${r.status} ${await r.text()}`);
      return ((await r.json()) as { id: string }).id;
    }, { title, body });
    created.push(id);
    return id;
  }
});
