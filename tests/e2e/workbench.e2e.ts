import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Browser, Download, Page } from "playwright-core";
import { BASE_URL, launch, watchErrors, open } from "./browser";
import { signIn } from "./auth";

async function readDownload(d: Download): Promise<string> {
  const stream = await d.createReadStream();
  const chunks: Buffer[] = [];
  for await (const c of stream) chunks.push(c as Buffer);
  return Buffer.concat(chunks).toString("utf8");
}

/**
 * The workbench in Chromium against the production build: the valve-coil demo re-simulates on an edit, a sweep draws
 * one curve per value, a long map can be cancelled, and a bad value is refused in place.
 * What is checked is behaviour the page must show (readouts change, counts match the settings), not fixed numbers:
 * the numbers themselves are the engine's and design layer's, tested against their references there.
 */
describe("workbench", () => {
  let browser: Browser;
  let page: Page;
  let errors: string[];

  beforeAll(async () => {
    browser = await launch();
    page = await browser.newPage({ viewport: { width: 1280, height: 800 }, acceptDownloads: true });
    errors = watchErrors(page);
    await signIn(page, "designer");
    await open(page, `${BASE_URL}/scenarios`);
    await page.getByRole("link", { name: "Valve coil driver", exact: true }).first().click();
    await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
  });

  afterAll(async () => {
    await browser?.close();
  });

  const text = async (testId: string) => (await page.getByTestId(testId).textContent())?.trim() ?? "";

  it("re-simulates when the compensation capacitor is typed in: phase margin and overshoot change", async () => {
    const field = page.locator("#field-parts-compCapacitor");
    const before = await field.inputValue();
    const pm0 = await text("metric-phase-margin-value");
    const os0 = await text("metric-overshoot-value");
    expect(pm0).toMatch(/°|no crossover/);
    // A value far from the demo's: ×47 or more in capacitance moves the loop's crossover a long way.
    const next = before === "4.7n" ? "100p" : "4.7n";
    await field.fill(next);
    await field.press("Enter");
    await page.waitForFunction(
      ([a, b]) =>
        document.querySelector('[data-testid="metric-phase-margin-value"]')?.textContent?.trim() !== a &&
        document.querySelector('[data-testid="metric-overshoot-value"]')?.textContent?.trim() !== b,
      [pm0, os0],
      { timeout: 30_000 },
    );
    expect(await text("metric-phase-margin-value")).not.toBe(pm0);
    expect(await text("metric-overshoot-value")).not.toBe(os0);
    expect(await text("dirty-indicator")).toContain("Unsaved changes");
    // The schematic shows the new value too.
    expect(await page.getByTestId("schematic-compCapacitor").textContent()).toContain(next === "4.7n" ? "4.70 nF" : "100 pF");

    // Undo and redo move the value back and forth.
    await page.getByTestId("undo").click();
    await expect.poll(() => field.inputValue(), { timeout: 5_000 }).toBe(before);
    await page.getByTestId("redo").click();
    await expect.poll(() => field.inputValue(), { timeout: 5_000 }).toBe(next);
    // From the keyboard too, with the focus still in the field that was edited.
    await field.focus();
    await page.keyboard.press("Control+z");
    await expect.poll(() => field.inputValue(), { timeout: 5_000 }).toBe(before);
    await page.keyboard.press("Control+Shift+z");
    await expect.poll(() => field.inputValue(), { timeout: 5_000 }).toBe(next);
  });

  it("the current loop's margin and the overshoot move together as the compensation capacitor grows", async () => {
    // Second-order relation (docs/references.md §5a): more phase margin, less overshoot. Checked as a user would see
    // it: the headline cards after each edit, and the Loop gain plot naming both loops.
    const field = page.locator("#field-parts-compCapacitor");
    const readings: { pm: number; os: number }[] = [];
    // a run still in flight from an earlier edit must land before a reading is taken
    const settled = () => expect.poll(() => text("run-status"), { timeout: 30_000 }).not.toContain("simulating");
    const setAndRead = async (value: string) => {
      await settled();
      const pm0 = await text("metric-phase-margin-value");
      await field.fill(value);
      await field.press("Enter");
      await page.waitForFunction(
        (a) => document.querySelector('[data-testid="metric-phase-margin-value"]')?.textContent?.trim() !== a,
        pm0,
        { timeout: 30_000 },
      );
      await settled();
      // both halves of the run arrive together; the overshoot card carries the small-signal figure beside it
      await page.getByTestId("metric-overshoot").filter({ hasText: "small-signal" }).waitFor({ timeout: 30_000 });
      return { pm: Number.parseFloat(await text("metric-phase-margin-value")), os: Number.parseFloat(await text("metric-overshoot-value")) };
    };
    if ((await field.inputValue()) === "100p") await setAndRead("47p"); // the first value below must be a change
    for (const value of ["100p", "2.2n", "10n"]) readings.push(await setAndRead(value));
    for (let i = 1; i < readings.length; i++) {
      expect(readings[i].pm).toBeGreaterThan(readings[i - 1].pm);
      expect(readings[i].os).toBeLessThan(readings[i - 1].os);
    }
    // the ringing design fails on both counts, the well-damped one passes on both
    expect(readings[0].pm).toBeLessThan(30);
    expect(readings[0].os).toBeGreaterThan(20);
    expect(readings[2].pm).toBeGreaterThan(60);
    expect(readings[2].os).toBeLessThan(5);
    expect(await page.getByTestId("metric-phase-margin").textContent()).toContain("local op-amp loop");
    expect(await page.getByTestId("plot-loop").textContent()).toContain("local op-amp loop");
  });

  it("exports the step response as CSV and the netlist as JSON", async () => {
    const [csv] = await Promise.all([page.waitForEvent("download"), page.getByTestId("export-step-csv").click()]);
    expect(csv.suggestedFilename()).toBe("Step-response.csv");
    const text = await readDownload(csv);
    const lines = text.trimEnd().split("\r\n");
    expect(lines[0]).toBe("time (s),Load current (A),Command (V),Op-amp output (V),Collector/drain (V)");
    expect(lines.length).toBeGreaterThan(20);
    // Every row has five numbers and time increases down the file.
    const times = lines.slice(1).map((l) => l.split(",").map(Number));
    expect(times.every((r) => r.length === 5 && r.every(Number.isFinite))).toBe(true);
    for (let i = 1; i < times.length; i++) expect(times[i]![0]!).toBeGreaterThan(times[i - 1]![0]!);

    const [json] = await Promise.all([page.waitForEvent("download"), page.getByTestId("export-netlist").click()]);
    const netlist = JSON.parse(await readDownload(json)) as { elements: { kind: string; name: string }[]; analysis: { kind: string } };
    expect(netlist.analysis.kind).toBe("tran");
    expect(netlist.elements.some((e) => e.kind === "opamp")).toBe(true);
    expect(netlist.elements.some((e) => e.name === "comp-capacitor")).toBe(true);
  });

  it("marks a value that is not a number in place, with the reason, and does not apply it", async () => {
    const field = page.locator("#field-parts-baseResistor");
    const before = await field.inputValue();
    const schematicBefore = await page.getByTestId("schematic-baseResistor").textContent();
    await field.fill("abc");
    await field.press("Enter");
    const row = page.getByTestId("field-parts-baseResistor");
    const err = row.getByTestId("field-error");
    await err.waitFor();
    expect(await err.textContent()).toContain('"abc" is not a number');
    expect(await field.getAttribute("aria-invalid")).toBe("true");
    expect(await page.getByTestId("schematic-baseResistor").textContent()).toBe(schematicBefore);
    // Escape restores the applied value.
    await field.press("Escape");
    await expect.poll(() => field.inputValue()).toBe(before);
  });

  it("the Noise tab shows the band's integrated load-current noise, and it moves when the sense resistor changes", async () => {
    await page.getByTestId("tab-noise").click();
    const figure = page.getByTestId("noise-integrated");
    await figure.waitFor({ timeout: 30_000 });
    const before = await figure.textContent();
    expect(before).toMatch(/A rms$/);
    expect(Number(await figure.getAttribute("data-value"))).toBeGreaterThan(0);
    expect(await page.getByTestId("noise-contributors").locator("li").count()).toBeGreaterThan(1);
    const field = page.locator("#field-parts-senseResistor");
    const old = await field.inputValue();
    await field.fill(old === "2" ? "3" : "2");
    await field.press("Enter");
    await expect.poll(async () => figure.textContent(), { timeout: 30_000 }).not.toBe(before);
    // back to the demo's value, so the tests after this one see the demo's circuit
    await field.fill(old);
    await field.press("Enter");
    await expect.poll(async () => figure.textContent(), { timeout: 30_000 }).toBe(before);
    await page.getByTestId("tab-closed").click();
  });

  it("a noise target set in the Noise panel adds a headline card judged against it; clearing it removes the card", async () => {
    await page.locator("#panel-noise summary").click();
    const target = page.locator("#field-noise-target");
    expect(await page.getByTestId("metric-noise").count()).toBe(0); // no target: no card
    await target.fill("1m");
    await target.press("Enter");
    await page.getByTestId("metric-noise").waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("metric-noise").textContent()).toContain("target 1.00 mA");
    // the card's figure is the Noise tab's integrated figure (one run, one number)
    await page.getByTestId("tab-noise").click();
    const rms = Number(await page.getByTestId("noise-integrated").getAttribute("data-value"));
    expect(rms).toBeGreaterThan(0);
    expect(rms).toBeLessThan(1e-3); // the demo's noise is microamperes: the 1 mA target passes
    expect(await page.getByTestId("metric-noise").textContent()).toMatch(/pass/i);
    await page.getByTestId("tab-closed").click();
    await target.fill("");
    await target.press("Enter");
    await expect.poll(() => page.getByTestId("metric-noise").count(), { timeout: 30_000 }).toBe(0);
    await page.locator("#panel-noise summary").click();
  });

  it("runs a 1D sweep and draws one curve per value", async () => {
    await page.getByTestId("studies-toggle").click();
    await page.getByTestId("studies-tab-sweep").click();
    const points = page.locator("#field-studies-sweep-points");
    await points.fill("5");
    await points.press("Enter");
    await page.getByTestId("sweep-run").click();
    await page.locator('[data-testid="study-status-sweep"][data-status="done"]').waitFor({ timeout: 120_000 });
    expect(await page.getByTestId("sweep-curve").count()).toBe(5);
    expect(await text("study-status-sweep")).toContain("Done: 5 of 5");
  });

  it("starts a long 2D map and cancels it: progress stops short of the end", async () => {
    await page.getByTestId("studies-tab-map").click();
    for (const axis of ["x", "y"]) {
      const f = page.locator(`#field-studies-map-${axis}-points`);
      await f.fill("40");
      await f.press("Enter");
    }
    await page.locator("#map-metric").selectOption("overshootPct");
    await page.getByTestId("map-run").click();
    const status = page.getByTestId("study-status-map");
    await page.locator('[data-testid="study-status-map"][data-status="running"]').waitFor({ timeout: 30_000 });
    await expect.poll(async () => Number(await page.getByTestId("study-progress-map").getAttribute("value")), { timeout: 60_000 }).toBeGreaterThan(0);
    await page.getByTestId("study-cancel-map").click();
    await page.locator('[data-testid="study-status-map"][data-status="cancelled"]').waitFor({ timeout: 10_000 });
    const done = Number(await page.getByTestId("study-progress-map").getAttribute("value"));
    expect(done).toBeGreaterThan(0);
    expect(done).toBeLessThan(1600);
    await page.waitForTimeout(1_000);
    expect(Number(await page.getByTestId("study-progress-map").getAttribute("value"))).toBe(done);
    expect(await status.textContent()).toContain("Cancelled");
  });

  it("starts a new scenario from a template as a local draft and simulates it", async () => {
    await open(page, `${BASE_URL}/scenarios/new`);
    await page.getByTestId("template-howland").click();
    await page.getByTestId("new-draft").click();
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    expect(await text("revision-label")).toContain("local draft");
    // The Howland pump's own parts are listed and drawn.
    for (const key of ["howlandR1", "howlandR2", "howlandR3", "howlandR4"]) {
      await page.locator(`#field-parts-${key}`).waitFor();
      await page.getByTestId(`schematic-${key}`).waitFor();
    }
    // Clicking a part in the schematic focuses its value field.
    await page.getByTestId("schematic-howlandR2").click();
    expect(await page.evaluate("document.activeElement && document.activeElement.id")).toBe("field-parts-howlandR2");
  });

  it("ran without page errors", () => {
    expect(errors.filter((e) => !/Failed to load resource/.test(e))).toEqual([]);
  });
});
