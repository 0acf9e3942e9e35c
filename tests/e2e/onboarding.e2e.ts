import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomBytes } from "node:crypto";
import bcrypt from "bcryptjs";
import type { Browser } from "playwright-core";
import { BASE_URL, launch, open } from "./browser";
import { db } from "@/lib/db/knex";
import { TEMPLATES } from "@/lib/design/templates";
import { demoScenarios } from "@/lib/design/demos";

/** A new team's empty scenario list offers starting points: each template, and a copy of each demo design. */
describe("onboarding: a new team's starting points", () => {
  let browser: Browser;
  const email = `starter.${randomBytes(4).toString("hex")}@new-team.test`;
  const password = "a-long-enough-password-2026";

  beforeAll(async () => {
    browser = await launch();
    const [team] = await db()("teams").insert({ name: "New bench team" }).returning("id");
    const [user] = await db()("users").insert({ email, name: "Sam Starter", password_hash: await bcrypt.hash(password, 4), current_team_id: team.id }).returning("id");
    await db()("memberships").insert({ team_id: team.id, user_id: user.id, role: "lead" });
  });

  afterAll(async () => {
    await browser?.close();
    await db().destroy();
  });

  it("one click on a demo design makes a copy of it in the team and opens it; afterwards the list shows it", async () => {
    const page = await browser.newPage();
    await open(page, `${BASE_URL}/sign-in`);
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.waitForURL((u) => u.pathname === "/scenarios");
    const start = page.getByTestId("starting-points");
    await start.waitFor();
    expect(await start.textContent()).toMatch(/set the load and supply first/);
    for (const t of TEMPLATES) await page.getByTestId(`start-template-${t.id}`).waitFor();
    for (const d of demoScenarios()) await page.getByTestId(`start-demo-${d.key}`).waitFor();
    expect(await page.getByText("No scenarios match.").count()).toBe(0);

    await page.getByTestId("start-demo-valve-coil").click();
    await page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    expect(await page.getByTestId("scenario-title").textContent()).toBe("Valve coil driver");
    await open(page, "/scenarios");
    await page.getByRole("table").getByRole("link", { name: "Valve coil driver", exact: true }).waitFor();
    expect(await page.getByTestId("starting-points").count()).toBe(0);
    await page.close();
  });
});
