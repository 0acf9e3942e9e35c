import { chromium, type Browser, type Page } from "playwright-core";

/** The server the test command started (a production build on a free port). */
export const BASE_URL = process.env.QUELL_BASE_URL ?? "http://127.0.0.1:3000";

/** Debian's Chromium through playwright-core; the flags keep it off the network this machine does not have. */
export async function launch(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.QUELL_CHROMIUM ?? "/usr/bin/chromium",
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}

/** Collects console errors and failed requests so a test can assert the page ran clean. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") errors.push(m.text());
  });
  page.on("pageerror", (e) => errors.push(e.message));
  return errors;
}

/** Go to a path (or URL) and wait until React has hydrated the page (see components/shell/HydrationMark). */
export async function open(page: Page, path: string): Promise<void> {
  await page.goto(path.startsWith("http") ? path : `${BASE_URL}${path}`, { waitUntil: "load" });
  await waitHydrated(page);
}

/**
 * Waits until React has hydrated the page and every client island streamed behind a Suspense boundary
 * (components/shell/IslandMark, useHydrated): input typed before then loses its event.
 */
export async function waitHydrated(page: Page): Promise<void> {
  await page.waitForSelector("html[data-hydrated]", { state: "attached", timeout: 30_000 });
  await page.waitForFunction(() => document.querySelector("[data-island]:not([data-ready])") === null, undefined, { timeout: 30_000 });
}

/**
 * Drags across a box (a plot's), from and to points given as fractions of its width and height: a zoom box, or with
 * `shift` a pan.
 */
export async function dragAcross(
  page: Page, b: { x: number; y: number; width: number; height: number },
  from: [number, number], to: [number, number], shift = false,
): Promise<void> {
  if (shift) await page.keyboard.down("Shift");
  await page.mouse.move(b.x + b.width * from[0], b.y + b.height * from[1]);
  await page.mouse.down();
  await page.mouse.move(b.x + b.width * to[0], b.y + b.height * to[1], { steps: 5 });
  await page.mouse.up();
  if (shift) await page.keyboard.up("Shift");
}
