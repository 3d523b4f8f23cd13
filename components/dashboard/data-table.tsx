import type { ReactNode } from "react";
import { cn } from "@/components/ui/cn";

/**
 * A dense table that scrolls sideways on narrow screens; the scroll region is a labelled, focusable
 * region so keyboard users can scroll it too (axe scrollable-region-focusable).
 */
export function DataTable({ caption, children, className }: { caption: string; children: ReactNode; className?: string }) {
  return (
    <div role="region" aria-label={caption} tabIndex={0} className="-mx-5 overflow-x-auto px-5 focus:outline-none focus-visible:ring-2 focus-visible:ring-pine-500">
      <table className={cn("w-full min-w-[32rem] border-collapse text-sm", className)}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}
