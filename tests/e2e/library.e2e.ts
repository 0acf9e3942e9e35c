import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Browser, BrowserContext, Page } from "playwright-core";
import { BASE_URL, launch, watchErrors, open } from "./browser";
import { demoUser, signIn } from "./auth";
import { resampleStep, valveScenario } from "./captures";
import { upgradeScenario } from "@/lib/design/upgrade";
import { db } from "@/lib/db/knex";
import { runStep } from "@/lib/design/run";

/**
 * The library journey: the designer uploads a bench capture of the valve-coil demo and submits revision N for
 * validation; the lead validates it; it appears in the library; the review page shows every section.
 *
 * The "bench capture" is the engine's own step response, delayed by 37 µs as a scope's pre-trigger would place it,
 * written as millivolts across the 1 Ω sense resistor with ±0.2 % seeded noise — so the comparison must pass.
 */
/** The newest mail to an address whose subject starts with `subject`, waiting for the local fake to store it. */
async function mailTo(email: string, subject: string, since: Date): Promise<{ subject: string; text_body: string } | undefined> {
  const end = Date.now() + 15_000;
  while (Date.now() < end) {
    const m = await db()("dev_mailbox").where("to_address", email).where("received_at", ">=", since).where("subject", "like", `${subject}%`).orderBy("id", "desc").first();
    if (m) return m;
    await new Promise((r) => setTimeout(r, 200));
  }
  return undefined;
}

function captureCsv(time: Float64Array, iLoad: Float64Array, senseOhms: number): string {
  let seed = 12345;
  const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  const span = time[time.length - 1] - time[0];
  const n = 4000;
  const delay = 37e-6;
  const lines = ["Model,Bench scope (test)", "Sample Interval," + (span / n).toExponential(4), "Time (us),CH1 (mV)"];
  const amplitude = Math.max(...iLoad) - Math.min(...iLoad);
  const scope = Array.from({ length: n }, (_, k) => time[0] + (k * span) / n); // scope time axis
  const values = resampleStep(time, iLoad, scope.map((t) => t - delay));
  scope.forEach((tScope, k) => {
    const noisy = values[k] + 0.002 * amplitude * (2 * rand() - 1);
    lines.push(`${(tScope * 1e6).toFixed(4)},${(noisy * senseOhms * 1e3).toFixed(5)}`);
  });
  return lines.join("\n");
}

describe("library: upload, submit, validate, review", () => {
  let browser: Browser;
  let designerCtx: BrowserContext;
  let leadCtx: BrowserContext;
  let scenarioId = "";
  let csvPath = "";
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

  it("the designer uploads a trace and submits the revision", async () => {
    const page: Page = await designerCtx.newPage();
    const errors = watchErrors(page);
    await signIn(page, "designer");
    const valve = await valveScenario(page);
    scenarioId = valve.id;
    const detail = valve.detail;
    const scenario = upgradeScenario(detail.body);
    const { time, series } = runStep(scenario);
    const step = { time, iLoad: series.iLoad };
    csvPath = join(mkdtempSync(join(tmpdir(), "quell-e2e-")), "valve-step.csv");
    writeFileSync(csvPath, captureCsv(step.time, step.iLoad, scenario.parts.senseResistor));

    await open(page, `${BASE_URL}/scenarios/${scenarioId}/traces`);
    // A malformed capture is refused in place, naming the line and the problem.
    const broken = csvPath.replace(/\.csv$/, "-broken.csv");
    const lines = captureCsv(step.time, step.iLoad, scenario.parts.senseResistor).split("\n");
    lines[9] = "12.5,n/a"; // line 10
    writeFileSync(broken, lines.join("\n"));
    // The upload form hydrates inside the page's Suspense boundary, possibly after the layout: wait for it.
    await page.locator('[data-testid="trace-upload"][data-ready="1"]').waitFor();
    await page.getByLabel("CSV file").setInputFiles(broken);
    await page.getByTestId("trace-error").waitFor();
    expect(await page.getByTestId("trace-error").textContent()).toContain('Line 10: column 2 (CH1): "n/a" is not a number.');
    expect(await page.getByRole("button", { name: "Upload trace" }).isDisabled()).toBe(true);

    await page.getByLabel("CSV file").setInputFiles(csvPath);
    await page.getByTestId("trace-preview").waitFor();
    expect(await page.getByTestId("trace-preview").textContent()).toContain("4,000 rows");
    await page.getByLabel("Label").fill("Bench step 3.0→3.3 V");
    await page.getByLabel("Channel 1 name").fill("Load current");
    await page.getByLabel("Channel 1 conversion").selectOption("sense");
    await page.getByLabel("Channel 1 sense resistor").fill(String(scenario.parts.senseResistor));
    await page.getByLabel("Probe / shunt").fill("1 Ω sense, 10:1 probe");
    await page.getByRole("button", { name: "Upload trace" }).click();
    await page.getByTestId("trace-list").getByText("Bench step 3.0→3.3 V").waitFor({ timeout: 30_000 });
    expect(await page.getByTestId("trace-list").textContent()).toContain("Probe / shunt: 1 Ω sense, 10:1 probe");

    // Measured against simulated: the capture is the simulation itself, delayed and noisy, so it passes.
    await page.getByTestId("comparison-verdict").waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("comparison-verdict").textContent()).toBe("pass");
    await page.getByTestId("comparison-plot").waitFor();

    const submittedAt = new Date(Date.now() - 2000);
    await page.getByLabel("Note for the reviewer").fill("Built on the bench board; 3.0→3.3 V command step, 1 Ω sense.");
    await page.getByRole("button", { name: "Submit for validation" }).click();
    await page.getByTestId("submit-message").getByText("Submitted for validation").waitFor({ timeout: 30_000 });
    await page.getByTestId("entry-status").waitFor();
    expect(await page.getByTestId("entry-status").textContent()).toContain("submitted");
    entryUrl = (await page.getByTestId("entry-status").getByRole("link").getAttribute("href")) ?? "";
    expect(entryUrl).toMatch(/^\/library\/[0-9a-f-]{36}$/);
    // The lead is told through the local mail fake, with a link to the entry.
    const mail = await mailTo(demoUser("lead").email, "Validation requested: Valve coil driver", submittedAt);
    expect(mail?.text_body).toContain(entryUrl);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("the lead sees the evidence and validates; the entry appears in the library", async () => {
    const page = await leadCtx.newPage();
    const errors = watchErrors(page);
    await signIn(page, "lead");
    await open(page, `${BASE_URL}/library?status=submitted`);
    await page.getByTestId("library-table").getByRole("link", { name: "Valve coil driver" }).first().click();
    await page.waitForURL((u) => u.pathname === entryUrl);
    await page.getByTestId("submitted-comparison").waitFor();
    await page.getByTestId("review-checks").waitFor({ timeout: 60_000 });
    await page.getByTestId("comparison-verdict").first().waitFor({ timeout: 60_000 });
    const decidedAt = new Date(Date.now() - 2000);
    await page.getByLabel("Comment").fill("Bench agrees with the simulation within the team's tolerances.");
    await page.getByRole("button", { name: "Validate" }).click();
    await page.getByTestId("entry-message").getByText("Validated.").waitFor({ timeout: 30_000 });
    await page.getByTestId("entry-validated-by").waitFor();
    expect(await page.getByTestId("entry-validated-by").textContent()).toContain(demoUser("lead").name);
    expect(await page.getByTestId("entry-history").textContent()).toContain("validated it");
    const mail = await mailTo(demoUser("designer").email, "Validated: Valve coil driver", decidedAt);
    expect(mail?.text_body).toContain("Bench agrees with the simulation");

    await open(page, `${BASE_URL}/library?status=validated&q=Valve`);
    const row = page.getByTestId("library-row").filter({ hasText: "Valve coil driver" }).first();
    await row.waitFor();
    expect(await row.textContent()).toContain("validated");
    expect(errors).toEqual([]);
    await page.close();
  });

  it("the review page renders every section, and prints without the app's chrome", async () => {
    const page = await designerCtx.newPage();
    const errors = watchErrors(page);
    await open(page, `${BASE_URL}/scenarios/${scenarioId}/review`);
    await page.locator('[data-testid="review-document"][data-sim-status="done"]').waitFor({ timeout: 60_000 });
    for (const id of ["review-schematic", "review-parts", "review-op", "review-checks", "review-cautions", "review-step-plot", "review-loop-plot", "review-bench", "review-status", "review-sign-off"]) {
      await expect(page.getByTestId(id).first().isVisible()).resolves.toBe(true);
    }
    // Schematic drawn, parts with tolerances and E-series, operating point numbers, a comparison verdict.
    expect(await page.getByTestId("review-schematic").locator("svg").count()).toBeGreaterThan(0);
    expect(await page.getByTestId("review-parts").textContent()).toMatch(/± \d.*(on|nearest) E(6|12|24|48|96|192)/s);
    expect(await page.getByTestId("review-op").textContent()).toMatch(/IC .*A/);
    expect(await page.getByTestId("review-loop-figures").textContent()).toMatch(/phase margin -?\d+\.\d°/i);
    await page.getByTestId("review-bench").getByTestId("bench-comparison").getByTestId("comparison-verdict").waitFor({ timeout: 60_000 });
    expect(await page.getByTestId("review-library-status").textContent()).toContain("validated");
    expect(await page.getByTestId("review-signed-off").textContent()).toContain(`Validated by ${demoUser("lead").name}`);

    await page.emulateMedia({ media: "print" });
    expect(await page.getByRole("button", { name: "Print or save as PDF" }).isVisible()).toBe(false);
    expect(await page.locator("header.no-print").first().isVisible()).toBe(false);
    expect(await page.getByTestId("review-sign-off").isVisible()).toBe(true);
    expect(errors).toEqual([]);
    await page.close();
  });

  it("a designer starts a new scenario from the validated entry", async () => {
    const page = await designerCtx.newPage();
    await open(page, `${BASE_URL}${entryUrl}`);
    await page.getByLabel("New scenario title").fill("Valve coil driver, second channel");
    await page.getByRole("button", { name: "Start from this" }).click();
    await page.waitForURL((u) => /^\/scenarios\/[0-9a-f-]{36}$/.test(u.pathname) && u.pathname !== `/scenarios/${scenarioId}`, { timeout: 30_000 });
    const newId = new URL(page.url()).pathname.split("/")[2];
    const created = await (await page.request.get(`${BASE_URL}/api/scenarios/${newId}`)).json();
    expect(created.title).toBe("Valve coil driver, second channel");
    expect(created.revisionNumber).toBe(1);
    await page.close();
  });
});
