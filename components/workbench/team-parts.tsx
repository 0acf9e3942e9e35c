"use client";
/**
 * The team's own parts in the workbench: the pickers offer them beside the built-in presets, and when the scenario's
 * op-amp or pass device came from a part that has a newer version since, an offer to update it.
 */
import { createContext, useContext } from "react";
import type { PartOption } from "@/lib/db/parts";
import { applyPart } from "@/lib/design/part-records";
import { useWb, useWbStore } from "./context";

const TeamParts = createContext<readonly PartOption[]>([]);

export function TeamPartsProvider({ parts, children }: { parts: readonly PartOption[]; children: React.ReactNode }) {
  return <TeamParts.Provider value={parts}>{children}</TeamParts.Provider>;
}

export function useTeamParts(kind: "opamp" | "pass"): readonly PartOption[] {
  return useContext(TeamParts).filter((p) => p.kind === kind);
}

/** "A newer version of this part exists — update?" for the op-amp and the pass device. */
export function PartUpdateOffer() {
  const all = useContext(TeamParts);
  const store = useWbStore();
  const opampRef = useWb((s) => s.scenario.opamp.part);
  const passRef = useWb((s) => (s.scenario.template === "howland" ? null : s.scenario.pass.part));
  const offers = [
    { slot: "opamp" as const, ref: opampRef, word: "op-amp" },
    { slot: "pass" as const, ref: passRef, word: "pass device" },
  ].flatMap(({ slot, ref, word }) => {
    if (!ref) return [];
    const newer = all.find((p) => p.id === ref.id && p.kind === slot && p.version > ref.version);
    return newer ? [{ slot, ref, word, newer }] : [];
  });
  if (offers.length === 0) return null;
  return (
    <div className="space-y-2">
      {offers.map(({ slot, ref, word, newer }) => (
        <div key={slot} role="status" data-testid={`part-update-${slot}`}
          className="flex flex-wrap items-center gap-2 rounded border border-verdict-warn/40 bg-verdict-warn/5 px-3 py-2 text-[13px]">
          <span className="flex-1">
            A newer version of this part exists — the {word} “{newer.name}” is at version {newer.version}; this scenario uses version {ref.version}. Update?
          </span>
          <button type="button" className="rounded bg-signal px-2 py-1 text-[12px] font-medium text-white" data-testid={`part-update-${slot}-apply`}
            onClick={() => store.getState().edit((s) => applyPart(s, { id: newer.id, version: newer.version, kind: newer.kind, name: newer.name, values: newer.values }))}>
            Update to version {newer.version}
          </button>
        </div>
      ))}
    </div>
  );
}
