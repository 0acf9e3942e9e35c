"use client";
import type { Engine } from "./engine";

export function StudiesDrawer({ open, onToggle, engine }: { open: boolean; onToggle: () => void; engine: Engine | null }) {
  void engine;
  return (
    <div className="sticky bottom-0 z-20 border-t border-hairline bg-white">
      <button type="button" onClick={onToggle} aria-expanded={open} className="w-full px-4 py-1.5 text-left text-[13px] font-semibold" data-testid="studies-toggle">
        Studies {open ? "▾" : "▴"}
      </button>
    </div>
  );
}
