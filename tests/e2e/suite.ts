import { afterAll, beforeAll } from "vitest";
import type { Browser, BrowserContextOptions, Page } from "playwright-core";
import { launch, watchErrors } from "./browser";

/**
 * A suite's Chromium and page: launched, and the page set up (signed in, a scenario opened…), before the suite's
 * tests; closed after them. `errors` collects the page's console errors (watchErrors). Call it inside `describe`.
 */
export function suitePage(setUp: (page: Page) => Promise<void>, options: BrowserContextOptions = {}): { browser: Browser; page: Page; errors: string[] } {
  const suite = {} as { browser: Browser; page: Page; errors: string[] };
  beforeAll(async () => {
    suite.browser = await launch();
    suite.page = await suite.browser.newPage({ viewport: { width: 1440, height: 900 }, ...options });
    suite.errors = watchErrors(suite.page);
    await setUp(suite.page);
  });
  afterAll(async () => {
    await suite.browser?.close();
  });
  return suite;
}
