import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "./cn";

/** A dense, calm table that scrolls sideways on narrow screens instead of overflowing the page. */
export function Table({ caption, children, className }: { caption: string; children: ReactNode; className?: string }) {
  // relative: the sr-only labels inside are absolutely placed and would otherwise widen the page.
  return (
    // A scrolling region must be reachable by keyboard and named (axe: scrollable-region-focusable).
    <div className="relative -mx-5 overflow-x-auto px-5" tabIndex={0} role="region" aria-label={caption}>
      <table className={cn("w-full min-w-[32rem] border-collapse text-sm", className)}>
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ className, numeric, ...rest }: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th
      scope="col"
      className={cn(
        "border-b border-tremor-border py-2 pr-4 text-left text-xs font-semibold uppercase tracking-wide text-tremor-content dark:border-dark-tremor-border dark:text-dark-tremor-content",
        numeric && "text-right",
        className,
      )}
      {...rest}
    />
  );
}

export function Td({ className, numeric, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <td
      className={cn(
        "border-b border-tremor-border py-2.5 pr-4 align-middle text-tremor-content-emphasis dark:border-dark-tremor-border dark:text-dark-tremor-content-emphasis",
        numeric && "text-right tabular-nums",
        className,
      )}
      {...rest}
    />
  );
}
