import type { Page } from "playwright-core";
import { DEMO_USERS } from "@/db/seeds/01_demo_team";
import { BASE_URL, open, waitHydrated } from "./browser";

export type DemoRole = "lead" | "designer" | "viewer";

/** The demo account of a role (db/seeds/01_demo_team.ts). */
export function demoUser(role: DemoRole) {
  const u = DEMO_USERS.find((x) => x.role === role);
  if (!u) throw new Error(`no demo user with role ${role}`);
  return u;
}

/**
 * Signs a page in as the demo lead, designer or viewer through the sign-in form, and waits until the app has
 * taken it to the scenarios (or to `next`). Afterwards `page.context()` carries the session cookie.
 */
export async function signIn(page: Page, role: DemoRole, next = "/scenarios"): Promise<void> {
  const u = demoUser(role);
  await open(page, `/sign-in?next=${encodeURIComponent(next)}`);
  if (new URL(page.url()).pathname !== "/sign-in") {
    // Someone is signed in already (the sign-in page sends them to their scenarios): sign them out first.
    await signOut(page);
    await open(page, `/sign-in?next=${encodeURIComponent(next)}`);
  }
  await page.getByLabel("E-mail").fill(u.email);
  await page.getByLabel("Password").fill(u.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => url.pathname === next.split("?")[0], { timeout: 30_000 });
  await waitHydrated(page);
}

/** Signs out through the top bar's menu form. */
export async function signOut(page: Page): Promise<void> {
  await open(page, "/sign-out");
  await page.getByRole("button", { name: "Sign out", exact: true }).click();
  await page.waitForURL((url) => url.pathname === "/sign-in");
}

/**
 * Signs in as `role` and opens the team's scenario of that title through the list's search (other suites add
 * scenarios, so it may be past the first page), then waits for the first run's phase margin.
 */
export async function openScenario(page: Page, role: DemoRole, title = "Valve coil driver"): Promise<void> {
  await signIn(page, role);
  await page.getByLabel("Search titles").fill(title);
  await page.getByRole("table").getByRole("link", { name: title, exact: true }).first().click();
  await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
  await page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
}
