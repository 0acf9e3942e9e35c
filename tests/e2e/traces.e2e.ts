import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { BASE_URL, launch, watchErrors, open } from "./browser";
import { signIn } from "./auth";
import { resampleStep, valveScenario } from "./captures";
import { upgradeScenario } from "@/lib/design/upgrade";
import { db } from "@/lib/db/knex";
import { runStep } from "@/lib/design/run";

/**
 * Bench traces that measure right, in the browser: two files uploaded in a row keep their own labels; a channel
 * without a unit cannot be compared (no verdicts) until its unit is corrected after upload; a lead validates a
 * failing comparison only with a written reason, which the entry and the library then show; the workbench draws
 * the latest trace over its step.
 *
 * The captures are the engine's own step of a copy of the valve-coil demo, resampled to 2 000 rows: one in amperes
 * named by its column ("coil_current_A") at half the amplitude (so the comparison fails), one with no unit at all.
 */
function captureCsv(time: Float64Array, iLoad: Float64Array, heading: string, gain: number): string {
  const n = 2000;
  const span = time[time.length - 1] - time[0];
  const at = Array.from({ length: n }, (_, k) => time[0] + (k * span) / (n - 1));
  const values = resampleStep(time, iLoad, at);
  return [`Time (us),${heading}`, ...at.map((t, k) => `${(t * 1e6).toFixed(4)},${(gain * values[k]).toExponential(6)}`)].join("\n");
}

describe("bench traces: labels, units, override", () => {
  let browser: Browser;
  let designerCtx: BrowserContext;
  let leadCtx: BrowserContext;
  let scenarioId = "";
  let halfPath = "";
  let barePath = "";
  let entryUrl = "";

  beforeAll(async () => {
    browser = await launch();
    designerCtx = await browser.newContext();
    leadCtx = await browser.newContext();
  });
  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("two files uploaded in a row each keep their own label; a channel without a unit is corrected after upload", async () => {
    const page: Page = await designerCtx.newPage();
    const errors = watchErrors(page);
    await signIn(page, "designer");
    const { detail } = await valveScenario(page);
    const created = await page.request.post(`${BASE_URL}/api/scenarios`, {
      headers: { origin: BASE_URL, "content-type": "application/json" },
      data: { title: `Valve coil bench ${Date.now()}`, template: detail.template, body: detail.body },
    });
    expect(created.status()).toBe(201);
    scenarioId = (await created.json()).id;
    const { time, series } = runStep(upgradeScenario(detail.body));
    const dir = mkdtempSync(join(tmpdir(), "quell-traces-"));
    halfPath = join(dir, "half-amplitude.csv");
    barePath = join(dir, "no-unit-capture.csv");
    writeFileSync(halfPath, captureCsv(time, series.iLoad, "coil_current_A", 0.5));
    writeFileSync(barePath, captureCsv(time, series.iLoad, "CH1", 1));

    await open(page, `/scenarios/${scenarioId}/traces`);
    await page.locator('[data-testid="trace-upload"][data-ready="1"]').waitFor();
    await page.getByLabel("CSV file").setInputFiles(halfPath);
    await page.getByTestId("trace-preview").waitFor();
    expect(await page.getByLabel("Label").inputValue()).toBe("half-amplitude");
    // the unit comes from the column name
    expect(await page.getByTestId("trace-preview").textContent()).toContain("coil_current [A]");
    await page.getByRole("button", { name: "Upload trace" }).click();
    await page.getByTestId("trace-list").getByText("half-amplitude", { exact: true }).waitFor({ timeout: 30_000 });

    await page.getByLabel("CSV file").setInputFiles(barePath);
    await page.getByTestId("trace-preview").getByText("CH1 [no unit]").waitFor();
    expect(await page.getByLabel("Label").inputValue()).toBe("no-unit-capture");
    await page.getByRole("button", { name: "Upload trace" }).click();
    await page.getByTestId("trace-list").getByText("no-unit-capture", { exact: true }).waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("trace-list").getByText("half-amplitude", { exact: true }).count()).toBe(1);

    // The newest trace is compared first: without a unit it cannot be, and no verdict shows.
    await page.getByLabel("Bench trace", { exact: true }).selectOption({ label: "no-unit-capture (rev 1)" });
    await page.getByTestId("unit-warning").waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("unit-warning").textContent()).toContain("Cannot compare: This channel has no unit");
    expect(await page.getByTestId("comparison-verdict").count()).toBe(0);
    // Corrected after upload, without the file: the numbers were amperes.
    await page.getByRole("button", { name: /Correct the unit of CH1/ }).click();
    await page.getByLabel("Channel unit correction").selectOption("A");
    await page.getByRole("button", { name: "Save the correction" }).click();
    await page.getByTestId("correction-message").getByText(/Saved: CH1 is now in A/).waitFor({ timeout: 30_000 });
    await page.getByTestId("comparison-verdict").waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("unit-warning").count()).toBe(0);
    expect(await page.getByTestId("alignment-edges").textContent()).toContain("Edges: measured step");

    // The half-amplitude capture fails against the simulation (RMS about half the step).
    await page.getByLabel("Bench trace", { exact: true }).selectOption({ label: "half-amplitude (rev 1)" });
    await page.getByTestId("comparison-verdict").getByText("fail").waitFor({ timeout: 60_000 });

    await page.getByLabel("Note for the reviewer").fill("Half-amplitude capture: probe attenuation unknown.");
    await page.getByRole("button", { name: "Submit for validation" }).click();
    await page.getByTestId("submit-message").getByText("Submitted for validation").waitFor({ timeout: 30_000 });
    await page.getByTestId("entry-status").waitFor();
    entryUrl = (await page.getByTestId("entry-status").getByRole("link").getAttribute("href")) ?? "";
    expect(entryUrl).toMatch(/^\/library\/[0-9a-f-]{36}$/);

    // The workbench draws the latest trace in amperes over its step.
    await open(page, `/scenarios/${scenarioId}`);
    await page.getByTestId("bench-overlay-toggle").check();
    await page.getByTestId("measured-legend").waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("measured-legend").textContent()).toContain("no-unit-capture");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("the lead validates the failing comparison only with a written reason; the entry and the library show it", async () => {
    const page = await leadCtx.newPage();
    const errors = watchErrors(page);
    await signIn(page, "lead");
    await open(page, entryUrl);
    await page.getByTestId("override-form").waitFor();
    // no plain Validate button: only the override, disabled until a reason is written
    expect(await page.getByRole("button", { name: "Validate", exact: true }).count()).toBe(0);
    const override = page.getByRole("button", { name: "Validate with override" });
    expect(await override.isDisabled()).toBe(true);
    const reason = "The second board measured right; this capture had the probe at 2:1.";
    await page.getByLabel("Override reason").fill(reason);
    await override.click();
    await page.getByTestId("entry-message").getByText("Validated with an override.").waitFor({ timeout: 30_000 });
    await page.getByTestId("entry-override").waitFor();
    expect(await page.getByTestId("entry-override").textContent()).toContain(reason);
    expect(await page.getByTestId("entry-history").textContent()).toContain("validated it with an override");

    await open(page, `/library?status=validated`);
    const row = page.getByTestId("library-row").filter({ has: page.locator(`a[href="${entryUrl}"]`) });
    await row.getByTestId("library-override").waitFor();
    expect(await row.getByTestId("library-override").textContent()).toBe("over failing evidence");
    expect(errors).toEqual([]);
    await page.close();
  });
});
