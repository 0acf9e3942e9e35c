"use client";
/**
 * The top bar's places and account: in a row on wide screens; behind a "Menu" button below 768 px, opening as a
 * panel under the bar (closed again by Esc, a chosen link, or the button).
 */
import { useEffect, useState, type ReactNode } from "react";
import { usePathname } from "next/navigation";

export function MainMenu({ children }: { children: ReactNode }) {
  const [open, setOpen] = useState(false);
  const path = usePathname();
  useEffect(() => setOpen(false), [path]);
  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") setOpen(false);
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, [open]);
  return (
    <>
      <button type="button" className="ml-auto rounded border border-hairline px-2 py-1 text-ink md:hidden" aria-expanded={open} aria-controls="main-menu" onClick={() => setOpen((o) => !o)} data-testid="menu-toggle">
        Menu
      </button>
      <div
        id="main-menu"
        className={`${open ? "flex" : "hidden"} absolute inset-x-0 top-12 z-50 flex-col items-start gap-3 border-b border-hairline bg-white p-4 shadow-md md:static md:flex md:flex-1 md:flex-row md:items-center md:gap-6 md:border-0 md:p-0 md:shadow-none`}
        onClick={(e) => {
          if ((e.target as Element).closest("a")) setOpen(false);
        }}
      >
        {children}
      </div>
    </>
  );
}
