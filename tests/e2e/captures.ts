import type { Page } from "playwright-core";
import { BASE_URL } from "./browser";

/** The team's "Valve coil driver" through the API (id and detail: template, body), as the signed-in page sees it. */
export async function valveScenario(page: Page): Promise<{ id: string; detail: { template: string; body: unknown } }> {
  const list = await (await page.request.get(`${BASE_URL}/api/scenarios?q=Valve`)).json();
  const valve = list.items.find((s: { title: string }) => s.title === "Valve coil driver");
  if (!valve) throw new Error("the demo team has no \"Valve coil driver\"");
  const detail = await (await page.request.get(`${BASE_URL}/api/scenarios/${valve.id}`)).json();
  return { id: valve.id, detail };
}

/**
 * A simulated step read at a scope's sample times (ascending), by linear interpolation; before the record it reads
 * the record's first value, after it the last. What the bench-capture writers of the e2e suites sample from.
 */
export function resampleStep(time: Float64Array, iLoad: Float64Array, at: readonly number[]): number[] {
  const out: number[] = [];
  let j = 0;
  for (const t of at) {
    while (j < time.length - 2 && time[j + 1] < t) j++;
    const f = Math.min(1, Math.max(0, (t - time[j]) / (time[j + 1] - time[j])));
    out.push(iLoad[j] + f * (iLoad[j + 1] - iLoad[j]));
  }
  return out;
}
