import Link from "next/link";
import type { ReactNode } from "react";
import { Logo } from "./logo";
import { ThemeToggle } from "./theme-toggle";

/** The calm frame of sign-in, onboarding and invitation screens: logo, one centred card, a theme switch. */
export function CenteredLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="mx-auto flex w-full max-w-5xl items-center justify-between px-4 py-4 sm:px-6">
        <Link href="/" aria-label="Peeksafe, home">
          <Logo />
        </Link>
        <ThemeToggle />
      </header>
      <main id="main" className="flex flex-1 items-start justify-center px-4 pb-16 pt-6 sm:pt-12">
        <div className="w-full max-w-md">{children}</div>
      </main>
    </div>
  );
}

/** The card and heading of one centred screen. */
export function CenteredCard({ title, description, children }: { title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <div className="rounded-tremor-default border border-tremor-border bg-white p-6 shadow-tremor-card dark:border-dark-tremor-border dark:bg-dark-tremor-background sm:p-8">
      <h1 className="text-xl font-semibold tracking-tight text-tremor-content-strong dark:text-dark-tremor-content-strong">{title}</h1>
      {description ? <p className="mt-2 text-sm text-tremor-content dark:text-dark-tremor-content">{description}</p> : null}
      <div className="mt-6">{children}</div>
    </div>
  );
}
