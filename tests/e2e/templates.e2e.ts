import { describe, expect, it } from "vitest";
import { open } from "./browser";
import { signIn } from "./auth";
import { TEMPLATES } from "@/lib/design/templates";
import { suitePage } from "./suite";

/**
 * A template's starting point is a sound design: opened in the browser (a local draft, simulated in the worker like
 * any scenario), every headline card and every row of the checks table reads "pass" — the figures people see, not
 * only the library's. The limits are the project's (lib/design/verdicts.ts; common practice) and the scenario's own.
 */
describe("templates open as sound designs", () => {
  const ui = suitePage((page) => signIn(page, "designer"));

  it.each(TEMPLATES.map((t) => t.id))("%s: every headline and every check passes", async (id) => {
    await open(ui.page, "/scenarios/new");
    await ui.page.getByTestId(`template-${id}`).click();
    await ui.page.getByTestId("new-draft").click();
    // Both halves of the run have landed: the step's figures and the checks beside the loop's.
    for (const m of ["phase-margin", "overshoot", "settling", "full-scale-error"]) {
      await ui.page.getByTestId(`metric-${m}-value`).filter({ hasNotText: "—" }).waitFor({ timeout: 90_000 });
    }
    await ui.page.getByTestId("checks-table").waitFor({ timeout: 90_000 });
    const words = await ui.page.evaluate(() => {
      const read = (root: Element | null, sel: string, badge: string) =>
        [...(root?.querySelectorAll(sel) ?? [])].map((el) => ({
          what: el.getAttribute("data-testid") ?? "",
          verdict: (el.querySelector(badge)?.textContent ?? "").trim().toLowerCase(),
        }));
      const cards = read(document.querySelector('[data-testid="headlines"]'), '[data-testid^="metric-"]:not([data-testid$="-value"])', "span.uppercase");
      const rows = read(document.querySelector('[data-testid="checks-table"]'), "tbody tr", "span.uppercase");
      return { cards, rows };
    });
    expect(words.cards.length).toBeGreaterThanOrEqual(6);
    expect(words.rows.length).toBeGreaterThanOrEqual(6);
    // A card without a figure to judge ("—", e.g. no −180° crossing for the gain margin) is not a failure.
    expect(words.cards.filter((c) => c.verdict !== "pass" && c.verdict !== "—")).toEqual([]);
    expect(words.rows.filter((r) => r.verdict !== "pass")).toEqual([]);
    expect(words.cards.find((c) => c.what === "metric-phase-margin")?.verdict).toBe("pass");
  });
});
