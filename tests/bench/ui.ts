/**
 * `npm run bench:ui` — edit-to-plot latency of the workbench in Chromium (playwright-core + Debian's Chromium).
 *
 * Needs a running Quell server with the demo team seeded, at QUELL_BASE_URL (default http://127.0.0.1:3000),
 * e.g. after `npm start`. Signs in as the demo designer, opens the valve-coil demo, and makes ≥ 30 edits of the
 * compensation capacitor by typing in its field. Each edit is timed inside the page from the Enter key to the
 * moment both the step-response and the loop-gain plots have redrawn with the new run (uPlot's draw hook counts
 * redraws on each plot's element). Prints one JSON line:
 *   {"case":"edit_to_plot","median_ms":…,"p95_ms":…,"runs":…}
 * Not a test: it asserts nothing about speed; targets live in the README.
 */
import type { Page } from "playwright-core";
import { BASE_URL, launch } from "../e2e/browser";
import { signIn } from "../e2e/auth";

/** Edits timed after the warm-up ones. */
const RUNS = Number(process.env.QUELL_BENCH_RUNS ?? 30);
const WARMUP = 3;
/** E12 values cycled through so that every edit changes the value. */
const VALUES = ["100p", "150p", "220p", "330p", "470p", "680p", "1n", "1.5n", "2.2n", "3.3n", "4.7n", "6.8n"];

function quantile(sorted: number[], q: number): number {
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos), hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

/** In the page: note both plots' redraw counts, stamp the Enter key, resolve when both plots have redrawn. */
const ARM = `(() => {
  const step = document.querySelector('[data-testid="uplot-step"]');
  const loop = document.querySelector('[data-testid="uplot-loop-mag"]');
  const s0 = Number(step.dataset.redraws || 0), l0 = Number(loop.dataset.redraws || 0);
  const field = document.getElementById("field-parts-compCapacitor");
  window.__quellEnterAt = undefined;
  field.addEventListener("keydown", (e) => { if (e.key === "Enter") window.__quellEnterAt = performance.now(); }, { once: true });
  window.__quellEdit = new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error("no redraw within 30 s")), 30000);
    const obs = new MutationObserver(() => {
      if (window.__quellEnterAt === undefined) return;
      if (Number(step.dataset.redraws || 0) > s0 && Number(loop.dataset.redraws || 0) > l0) {
        obs.disconnect();
        clearTimeout(timer);
        resolve(performance.now() - window.__quellEnterAt);
      }
    });
    obs.observe(step, { attributes: true, attributeFilter: ["data-redraws"] });
    obs.observe(loop, { attributes: true, attributeFilter: ["data-redraws"] });
  });
})()`;

/** One edit: arm the watcher in the page, type the value, press Enter, wait for both plots to redraw. */
async function timedEdit(page: Page, value: string): Promise<number> {
  // Passed as source text: tsx's transform would otherwise add helpers the page does not have.
  await page.evaluate(ARM);
  const field = page.locator("#field-parts-compCapacitor");
  await field.fill(value);
  await field.press("Enter");
  return page.evaluate("window.__quellEdit") as Promise<number>;
}

export async function run(): Promise<void> {
  const browser = await launch();
  try {
    const page = await browser.newPage({ viewport: { width: 1280, height: 800 } });
    await signIn(page, "designer");
    await page.goto(`${BASE_URL}/scenarios`, { waitUntil: "load" });
    await page.getByRole("link", { name: "Valve coil driver", exact: true }).first().click();
    await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    const times: number[] = [];
    let k = 0;
    let last = await page.locator("#field-parts-compCapacitor").inputValue();
    for (let i = 0; i < WARMUP + RUNS; i++) {
      // Every edit must change the value, or nothing re-runs.
      let value = VALUES[k++ % VALUES.length]!;
      if (value === last) value = VALUES[k++ % VALUES.length]!;
      const ms = await timedEdit(page, value);
      last = value;
      if (i >= WARMUP) times.push(ms);
    }
    times.sort((a, b) => a - b);
    const round = (x: number) => Math.round(x * 10) / 10;
    console.log(JSON.stringify({ case: "edit_to_plot", median_ms: round(quantile(times, 0.5)), p95_ms: round(quantile(times, 0.95)), runs: times.length }));
  } finally {
    await browser.close();
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  await run();
}
