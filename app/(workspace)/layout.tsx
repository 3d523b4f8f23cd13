import Link from "next/link";
import type { ReactNode } from "react";
import { Logo } from "@/components/shell/logo";
import { MainNav, type NavItem } from "@/components/shell/main-nav";
import { MobileMenu } from "@/components/shell/mobile-menu";
import { SignOutButton } from "@/components/shell/sign-out-button";
import { ThemeToggle } from "@/components/shell/theme-toggle";
import { WorkspaceSwitcher } from "@/components/shell/workspace-switcher";
import { listMemberships } from "@/db/queries/members";
import { requireWorkspace } from "@/lib/auth/session";
import { isMailCatcherEnabled } from "@/lib/env";

const NAV_ITEMS: NavItem[] = [
  { href: "/campaigns", label: "Campaigns" },
  { href: "/planner", label: "Planner" },
  { href: "/docs/api", label: "API" },
  { href: "/settings", label: "Settings" },
];

export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const { session, membership } = await requireWorkspace();
  const memberships = await listMemberships(session.user.id);
  const items = isMailCatcherEnabled() ? [...NAV_ITEMS, { href: "/mailbox", label: "Mailbox" }] : NAV_ITEMS;
  const workspaces = memberships.map((entry) => ({ id: entry.workspaceId, name: entry.workspaceName, role: entry.role }));
  const account = (
    <div className="flex min-w-0 flex-col gap-3 lg:flex-row lg:items-center">
      <WorkspaceSwitcher workspaces={workspaces} activeId={membership.workspaceId} />
      <p className="min-w-0 truncate text-sm text-tremor-content dark:text-dark-tremor-content" title={session.user.email}>
        <span className="sr-only">Signed in as </span>
        <span className="font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">{session.user.name || session.user.email}</span>
      </p>
      <div className="flex items-center gap-2">
        <ThemeToggle />
        <SignOutButton />
      </div>
    </div>
  );

  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-white focus:px-3 focus:py-2 focus:text-sm">
        Skip to content
      </a>
      <header className="relative border-b border-tremor-border bg-white dark:border-dark-tremor-border dark:bg-dark-tremor-background">
        <div className="mx-auto flex max-w-7xl items-center justify-between gap-4 px-4 py-3 sm:px-6">
          <div className="flex min-w-0 items-center gap-6">
            <Link href="/campaigns" aria-label="Peeksafe, campaigns" className="shrink-0">
              <Logo />
            </Link>
            <nav aria-label="Main" className="hidden lg:block">
              <MainNav items={items} />
            </nav>
          </div>
          <div className="hidden lg:block">{account}</div>
          <MobileMenu>
            <nav aria-label="Main" className="mb-4">
              <MainNav items={items} className="flex-col" />
            </nav>
            {account}
          </MobileMenu>
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 sm:px-6">
        {children}
      </main>
    </div>
  );
}
