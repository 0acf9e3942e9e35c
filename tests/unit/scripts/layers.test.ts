import { describe, expect, it } from "vitest";
import { fileURLToPath } from "node:url";
import { allowed, importGraph, importsOf, layerOf, violations, type ImportEdge } from "@/scripts/layers";

const root = fileURLToPath(new URL("../../..", import.meta.url));
const edge = (from: string, to: string, typeOnly = false): ImportEdge => ({ from, to, specifier: to, typeOnly, line: 1 });

describe("the layer table (DEVELOPERS.md) as a check", () => {
  const graph = importGraph(root);

  it("finds the repository's imports (the check below has something to check)", () => {
    expect(graph.length).toBeGreaterThan(500);
    expect(graph).toContainEqual(expect.objectContaining({ from: "components/shell/TopBar.tsx", to: "components/account/UserMenu.tsx" }));
    expect(graph).toContainEqual(expect.objectContaining({ from: "lib/db/revisions.ts", to: "lib/db/knex.ts", typeOnly: false }));
  });

  it("no import in the repository crosses a layer the table forbids", () => {
    expect(violations(graph).map((v) => `${v.from}:${v.line} → ${v.to}`)).toEqual([]);
  });

  it("refuses the crossings the table forbids", () => {
    const forbidden = [
      edge("components/shell/TopBar.tsx", "lib/db/users.ts"), // components never import lib/db values
      edge("components/shell/TopBar.tsx", "app/(account)/actions.ts", true), // nor anything of app/
      edge("lib/db/library.ts", "lib/auth/current.ts"),
      edge("lib/db/library.ts", "lib/mail/transport.ts"),
      edge("lib/db/traces.ts", "lib/traces/parse.ts", true),
      edge("lib/db/scenarios.ts", "lib/design/scenarioBody.ts"),
      edge("lib/mail/outbox.ts", "lib/db/knex.ts"),
      edge("lib/traces/parse.ts", "lib/api/body.ts"),
      edge("workers/jobs.ts", "lib/workbench/types.ts", true),
      edge("lib/sim/index.ts", "lib/design/schema.ts"),
      edge("lib/design/run.ts", "components/plots/palette.ts"),
      edge("lib/library/workflow.ts", "lib/db/knex.ts"), // the workflow goes through the query modules
      edge("components/library/LibraryTable.tsx", "lib/db/knex.ts", true),
    ];
    expect(violations(forbidden).map((v) => v.from + " → " + v.to)).toEqual(forbidden.map((e) => e.from + " → " + e.to));
  });

  it("allows what the table allows, types where it says types", () => {
    expect(allowed("components", "lib/db", true)).toBe(true);
    expect(allowed("components", "lib/db", false)).toBe(false);
    expect(allowed("lib/db", "lib/shared", false)).toBe(true);
    expect(allowed("lib/library", "lib/db", false)).toBe(true);
    expect(allowed("lib/db", "lib/db/knex.ts", false)).toBe(true);
    expect(allowed("app", "components", false)).toBe(true);
    expect(layerOf("lib/errors.ts")).toBe("lib/errors.ts");
    expect(layerOf("lib/design/scenarioBody.ts")).toBe("lib/design");
  });

  it("tells type-only imports from imports that run code", () => {
    const src = [
      'import type { A } from "@/lib/db/a";',
      'import { type B, c } from "@/lib/db/b";',
      'import { type D } from "@/lib/db/d";',
      'export { e } from "@/lib/db/e";',
      'export type { F } from "@/lib/db/f";',
      'import "@/lib/db/g";',
      'const h = await import("@/lib/db/h");',
      'let i: import("@/lib/db/i").I;',
    ].join("\n");
    expect(importsOf("x.ts", src).map((i) => [i.specifier.slice(-1), i.typeOnly])).toEqual([
      ["a", true], ["b", false], ["d", true], ["e", false], ["f", true], ["g", false], ["h", false], ["i", true],
    ]);
  });
});
