import { describe, expect, it } from "vitest";
import { open } from "./browser";
import { signIn } from "./auth";
import { suitePage } from "./suite";

/**
 * Networks and the team's parts in Chromium against the production build. Checked as a user sees it: the valve demo's
 * ringing falls when a load snubber goes across the coil (the figures' values are the design layer's, tested against
 * their references in tests/unit/lib/design/networks.test.ts); a team op-amp made on the Parts page is picked in a
 * scenario, saved, given a new version, and the scenario then offers the update.
 */
describe("networks and team parts", () => {
  const ui = suitePage((page) => signIn(page, "designer"), { viewport: { width: 1280, height: 800 } });

  const text = async (testId: string) => (await ui.page.getByTestId(testId).textContent())?.trim() ?? "";

  it("a load snubber across the valve demo's coil: the margin rises and the overshoot falls", async () => {
    await open(ui.page, "/scenarios");
    await ui.page.getByRole("link", { name: "Valve coil driver", exact: true }).first().click();
    await ui.page.waitForURL(/\/scenarios\/[0-9a-f-]{36}$/, { timeout: 30_000 });
    await ui.page.getByTestId("metric-overshoot").filter({ hasText: "small-signal" }).waitFor({ timeout: 60_000 });
    const pm0 = Number.parseFloat(await text("metric-phase-margin-value"));
    const os0 = Number.parseFloat(await text("metric-overshoot-value"));
    await ui.page.locator("#panel-networks > summary").click();
    await ui.page.getByTestId("network-loadSnubber").check();
    await expect.poll(async () => Number.parseFloat(await text("metric-phase-margin-value")), { timeout: 30_000 }).toBeGreaterThan(pm0);
    await ui.page.getByTestId("metric-overshoot").filter({ hasText: "small-signal" }).waitFor({ timeout: 30_000 });
    await expect.poll(async () => Number.parseFloat(await text("metric-overshoot-value")), { timeout: 30_000 }).toBeLessThan(os0);
    // drawn in place, with its values in the Networks panel
    await ui.page.getByTestId("schematic-loadSnubber").waitFor();
    expect(await ui.page.locator("#field-networks-loadSnubber-resistance").inputValue()).not.toBe("");
    // the checks say what its resistor dissipates, with the formula
    await ui.page.getByText("Load snubber resistor dissipation").first().waitFor({ timeout: 30_000 });
    expect(ui.errors).toEqual([]);
  });

  it("a team op-amp: create it, use it in a scenario, give it a new version, and the scenario offers the update", async () => {
    const name = `Bench amp ${Date.now()}`;
    const slug = name.replace(/[^\w]+/g, "-").toLowerCase();
    await open(ui.page, "/team/parts");
    await ui.page.getByTestId("part-new-name").fill(name);
    await ui.page.getByTestId("part-new-GBW").fill("2M");
    await ui.page.getByTestId("part-new-save").click();
    await ui.page.getByTestId(`part-${slug}`).waitFor({ timeout: 30_000 });
    expect(await text(`part-${slug}-version`)).toBe("version 1");

    // a scenario of its own, made through the API as the designer
    const id = await ui.page.evaluate(async () => {
      const r = await fetch("/api/scenarios", { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ title: `Team amp trial ${Date.now()}`, template: "sink-npn" }) });
      return ((await r.json()) as { id: string }).id;
    });
    await open(ui.page, `/scenarios/${id}`);
    await ui.page.getByTestId("metric-phase-margin-value").filter({ hasNotText: "—" }).waitFor({ timeout: 60_000 });
    await ui.page.locator("#panel-opamp > summary").click();
    await ui.page.locator("#opamp-preset").selectOption({ label: `Team: ${name} (v1)` });
    await expect.poll(() => ui.page.locator("#field-opamp-GBW").inputValue(), { timeout: 10_000 }).toBe("2M");
    await ui.page.getByTestId("save-open").click();
    await ui.page.getByTestId("save-note").fill("with the team's amp");
    await ui.page.getByTestId("save-submit").click();
    await ui.page.getByRole("status").getByText("Saved as revision 2").waitFor({ timeout: 30_000 });
    expect(await ui.page.getByTestId("part-update-opamp").count()).toBe(0);

    // a new version on the Parts page
    await open(ui.page, "/team/parts");
    await ui.page.getByTestId(`part-${slug}-edit`).click();
    await ui.page.getByTestId(`part-${slug}-GBW`).fill("4M");
    await ui.page.getByTestId(`part-${slug}-save`).click();
    await expect.poll(() => text(`part-${slug}-version`), { timeout: 30_000 }).toBe("version 2");

    // the scenario still uses version 1, and offers version 2
    await open(ui.page, `/scenarios/${id}`);
    const offer = ui.page.getByTestId("part-update-opamp");
    await offer.waitFor({ timeout: 30_000 });
    expect(await offer.textContent()).toMatch(/newer version of this part exists.*version 2.*version 1/);
    await ui.page.locator("#panel-opamp > summary").click();
    expect(await ui.page.locator("#field-opamp-GBW").inputValue()).toBe("2M");
    await ui.page.getByTestId("part-update-opamp-apply").click();
    await expect.poll(() => ui.page.locator("#field-opamp-GBW").inputValue(), { timeout: 10_000 }).toBe("4M");
    expect(await ui.page.getByTestId("part-update-opamp").count()).toBe(0);
    expect(ui.errors).toEqual([]);
  });
});
