"use client";

import { useSyncExternalStore } from "react";
import { THEME_STORAGE_KEY } from "./theme-script";

function subscribe(onChange: () => void) {
  const observer = new MutationObserver(onChange);
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ["class"] });
  return () => observer.disconnect();
}

const isDark = () => document.documentElement.classList.contains("dark");

/** Switches between light and dark; the choice is kept in localStorage and applied before paint by ThemeScript. */
export function ThemeToggle() {
  const dark = useSyncExternalStore(subscribe, isDark, () => false);
  function toggle() {
    const next = !isDark();
    document.documentElement.classList.toggle("dark", next);
    try {
      localStorage.setItem(THEME_STORAGE_KEY, next ? "dark" : "light");
    } catch {
      // storage may be off (private mode); the toggle still works for this page
    }
  }
  return (
    <button
      type="button"
      onClick={toggle}
      aria-pressed={dark}
      className="inline-flex items-center gap-2 rounded-tremor-default px-2.5 py-1.5 text-sm text-tremor-content-emphasis hover:bg-tremor-background-subtle dark:text-dark-tremor-content-emphasis dark:hover:bg-dark-tremor-background-subtle"
    >
      <svg aria-hidden="true" viewBox="0 0 20 20" className="h-4 w-4" fill="currentColor">
        {dark ? (
          <path d="M10 3a1 1 0 0 1 1 1v1a1 1 0 1 1-2 0V4a1 1 0 0 1 1-1Zm0 4a3 3 0 1 1 0 6 3 3 0 0 1 0-6Zm6 2a1 1 0 1 1 0 2h-1a1 1 0 1 1 0-2h1ZM5 9a1 1 0 1 1 0 2H4a1 1 0 1 1 0-2h1Zm5 6a1 1 0 0 1 1 1v0a1 1 0 1 1-2 0v0a1 1 0 0 1 1-1Z" />
        ) : (
          <path d="M15.5 12.6A6.5 6.5 0 0 1 7.4 4.5a6.5 6.5 0 1 0 8.1 8.1Z" />
        )}
      </svg>
      <span>{dark ? "Light mode" : "Dark mode"}</span>
    </button>
  );
}
