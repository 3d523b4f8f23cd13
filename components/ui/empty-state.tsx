import type { ReactNode } from "react";

/** What a list shows when it has nothing yet: a sentence and, optionally, the next step. */
export function EmptyState({ title, description, action }: { title: string; description?: ReactNode; action?: ReactNode }) {
  return (
    <div className="rounded-tremor-default border border-dashed border-tremor-border px-6 py-10 text-center dark:border-dark-tremor-border">
      <p className="text-sm font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">{title}</p>
      {description ? <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">{description}</p> : null}
      {action ? <div className="mt-4 flex justify-center">{action}</div> : null}
    </div>
  );
}
