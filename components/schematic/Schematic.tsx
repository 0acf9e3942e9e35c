"use client";
/**
 * The circuit of the chosen template, drawn as SVG with our IEC 60617 / IEEE 315 symbols. Every part is a button:
 * clicking it (or Enter/Space on it) selects it and focuses its value field. With the operating point at hand,
 * node voltages and the load current are written beside the nodes. One layout per template family:
 * SinkLayout (low-side sinks), HighSideLayout (high-side source), HowlandLayout (Howland pump).
 */
import { opHighlights } from "@/lib/design/op-words";
import { formatEng } from "@/lib/units/eng";
import type { Scenario } from "@/lib/design/schema";
import type { OperatingPointView } from "./parts";
import { SinkLayout } from "./SinkLayout";
import { HighSideLayout } from "./HighSideLayout";
import { HowlandLayout } from "./HowlandLayout";

export type { OperatingPointView };

/** Branch currents and device figures worth reading off the operating point, as one line. */
function opSummary(op: OperatingPointView): string {
  const parts: string[] = [];
  const h = opHighlights(op);
  if (h.driveCurrent !== null) parts.push(`I(drive) ${formatEng(h.driveCurrent, "A")}`);
  if (h.passPower !== null) parts.push(`P(pass) ${formatEng(h.passPower, "W")}`);
  if (h.opampLimiting) parts.push("op-amp limiting");
  return parts.join(" · ");
}

export interface SchematicProps {
  scenario: Scenario;
  selected: string | null;
  onSelect: (key: string) => void;
  op: OperatingPointView | null;
  showOp: boolean;
}

export function Schematic({ scenario, selected, onSelect, op, showOp }: SchematicProps) {
  const view = showOp ? op : null;
  const loadCurrent = view ? (opHighlights(view).loadCurrent ?? undefined) : undefined;
  return (
    <svg
      viewBox="0 0 590 400"
      className="h-auto w-full select-none"
      role="group"
      aria-label="Circuit schematic"
      data-testid="schematic"
    >
      {scenario.template === "howland" ? (
        <HowlandLayout s={scenario} sel={selected} on={onSelect} op={view} />
      ) : scenario.template === "source-highside" ? (
        <HighSideLayout s={scenario} sel={selected} on={onSelect} op={view} />
      ) : (
        <SinkLayout s={scenario} sel={selected} on={onSelect} op={view} />
      )}
      {view && (
        <text x={6} y={394} fontSize={12} fill="#0F766E" className="num" data-testid="op-summary">{opSummary(view)}</text>
      )}
      {view && loadCurrent !== undefined && (
        <text x={586} y={394} fontSize={12.5} textAnchor="end" fill="#0F766E" fontWeight={600} className="num">
          I(load) = {formatEng(loadCurrent, "A")}
        </text>
      )}
    </svg>
  );
}
