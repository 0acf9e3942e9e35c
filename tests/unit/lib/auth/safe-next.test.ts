import { describe, expect, it } from "vitest";
import { safeNext } from "@/lib/auth/safe-next";

// What a browser makes of each value is what the WHATWG URL Standard's basic URL parser makes of it (the same
// parser Node's URL implements): leading/trailing C0 controls and spaces are trimmed, ASCII tab and newline are
// removed anywhere, and "\" counts as "/" in special schemes.
describe("the return path after signing in", () => {
  it("keeps paths on this site, with their query and fragment", () => {
    expect(safeNext("/scenarios/123?tab=history#rev-2")).toBe("/scenarios/123?tab=history#rev-2");
    expect(safeNext("/invitations/abc_DEF-123")).toBe("/invitations/abc_DEF-123");
  });

  it("refuses other sites however they are spelled", () => {
    for (const evil of ["//evil.example", "/\\evil.example", "/\t/evil.example", "/\n/evil.example", "/\r\n/evil.example", "https://evil.example", "\t//evil.example", "/\\\\evil.example"]) {
      expect(safeNext(evil)).toBe("/scenarios");
      // The browser's own reading of the value we return stays on the site.
      expect(new URL(safeNext(evil), "https://quell.example").origin).toBe("https://quell.example");
    }
  });

  it("refuses what is not a path at all", () => {
    expect(safeNext(undefined)).toBe("/scenarios");
    expect(safeNext("scenarios")).toBe("/scenarios");
    expect(safeNext("javascript:alert(1)")).toBe("/scenarios");
    expect(safeNext("/" + "a".repeat(3000))).toBe("/scenarios");
  });
});
