import type { ReactNode } from "react";
import { cn } from "./cn";

export function Card({ children, className, as: Tag = "section", ...rest }: { children: ReactNode; className?: string; as?: "section" | "div" | "article"; "aria-labelledby"?: string }) {
  return (
    <Tag
      className={cn(
        "rounded-tremor-default border border-tremor-border bg-white p-5 shadow-tremor-card dark:border-dark-tremor-border dark:bg-dark-tremor-background",
        className,
      )}
      {...rest}
    >
      {children}
    </Tag>
  );
}

export function CardHeader({ id, title, description, actions }: { id?: string; title: string; description?: ReactNode; actions?: ReactNode }) {
  return (
    <div className="mb-4 flex flex-wrap items-start justify-between gap-3">
      <div className="min-w-0">
        <h2 id={id} className="text-base font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">
          {title}
        </h2>
        {description ? <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">{description}</p> : null}
      </div>
      {actions ? <div className="flex shrink-0 gap-2">{actions}</div> : null}
    </div>
  );
}
