"use client";

import { useState, type MouseEvent, type ReactNode } from "react";

/** A disclosure for narrow screens: one labelled button opens the navigation and account panel. */
export function MobileMenu({ children }: { children: ReactNode }) {
  const [open, setOpen] = useState(false);
  function closeOnLink(event: MouseEvent<HTMLDivElement>) {
    if ((event.target as HTMLElement).closest("a")) setOpen(false);
  }
  return (
    <div className="lg:hidden">
      <button
        type="button"
        aria-expanded={open}
        aria-controls="mobile-menu"
        onClick={() => setOpen((value) => !value)}
        className="rounded-tremor-default border border-tremor-border px-3 py-1.5 text-sm font-medium dark:border-dark-tremor-border"
      >
        {open ? "Close menu" : "Menu"}
      </button>
      {open ? (
        <div id="mobile-menu" onClick={closeOnLink} className="absolute inset-x-0 top-full z-20 border-b border-tremor-border bg-white p-4 shadow-tremor-dropdown dark:border-dark-tremor-border dark:bg-dark-tremor-background">
          {children}
        </div>
      ) : null}
    </div>
  );
}
