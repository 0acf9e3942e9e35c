import { describe, expect, it } from "vitest";
import { dropDraft, readDraft, writeDraft } from "@/lib/workbench/drafts";

/** A Map-backed stand-in for localStorage. */
function memoryStorage() {
  const m = new Map<string, string>();
  return { getItem: (k: string) => m.get(k) ?? null, setItem: (k: string, v: string) => void m.set(k, v), removeItem: (k: string) => void m.delete(k), m };
}

describe("kept drafts", () => {
  it("keeps one draft per scenario and gives it back as written", () => {
    const st = memoryStorage();
    writeDraft(st, "a", { baseRevisionId: "r1", scenario: { x: 1 }, savedAt: 5 });
    writeDraft(st, "b", { baseRevisionId: "r9", scenario: { x: 2 }, savedAt: 6 });
    expect(readDraft(st, "a")).toEqual({ baseRevisionId: "r1", scenario: { x: 1 }, savedAt: 5 });
    dropDraft(st, "a");
    expect(readDraft(st, "a")).toBeNull();
    expect(readDraft(st, "b")?.scenario).toEqual({ x: 2 });
  });

  it("reads nothing from a damaged entry or a missing storage, and never throws", () => {
    const st = memoryStorage();
    st.setItem("quell:draft:a", "{not json");
    expect(readDraft(st, "a")).toBeNull();
    st.setItem("quell:draft:a", JSON.stringify({ scenario: {} }));
    expect(readDraft(st, "a")).toBeNull();
    expect(readDraft(null, "a")).toBeNull();
    const full = { ...st, setItem: () => { throw new Error("QuotaExceededError"); } };
    expect(() => writeDraft(full, "a", { baseRevisionId: "r", scenario: {}, savedAt: 1 })).not.toThrow();
  });
});
