"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cn } from "@/components/ui/cn";

export interface NavItem {
  href: string;
  label: string;
}

/** The workspace's main navigation; the current section is marked with aria-current and an underline. */
export function MainNav({ items, className }: { items: NavItem[]; className?: string }) {
  const pathname = usePathname();
  return (
    <ul className={cn("flex gap-1", className)}>
      {items.map((item) => {
        const current = pathname === item.href || pathname.startsWith(`${item.href}/`);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={current ? "page" : undefined}
              className={cn(
                "block rounded-tremor-default px-3 py-2 text-sm font-medium underline-offset-[6px] hover:bg-tremor-background-subtle dark:hover:bg-dark-tremor-background-subtle",
                current
                  ? "text-pine-800 underline decoration-2 dark:text-pine-200"
                  : "text-tremor-content-emphasis dark:text-dark-tremor-content-emphasis",
              )}
            >
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
