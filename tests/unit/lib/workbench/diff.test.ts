import { describe, expect, it } from "vitest";
import { scenarioDiff } from "@/lib/workbench/diff";
import { valveCoilDemo } from "@/lib/design/demos";

describe("scenarioDiff (the conflict view's list of differing values)", () => {
  it("is empty for equal scenarios and names each changed leaf by its path", () => {
    const a = valveCoilDemo();
    expect(scenarioDiff(a, structuredClone(a))).toEqual([]);
    const b = structuredClone(a);
    b.parts.compCapacitor = 4.7e-9;
    b.load.cable.length = 10;
    expect(scenarioDiff(a, b)).toEqual([
      { path: "parts.compCapacitor", mine: a.parts.compCapacitor, theirs: 4.7e-9 },
      { path: "load.cable.length", mine: a.load.cable.length, theirs: 10 },
    ]);
  });

  it("reports a field present on one side only, and compares arrays whole", () => {
    expect(scenarioDiff({ x: 1 }, { x: 1, y: null })).toEqual([{ path: "y", mine: undefined, theirs: null }]);
    expect(scenarioDiff({ v: [1, 2] }, { v: [1, 3] })).toEqual([{ path: "v", mine: [1, 2], theirs: [1, 3] }]);
  });
});
