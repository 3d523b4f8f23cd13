"use client";

import { Button, Card, Notice } from "@/components/ui";

/** What a screen shows while its data loads: a labelled placeholder, announced to screen readers. */
export function ScreenLoading({ label }: { label: string }) {
  return (
    <div role="status" aria-live="polite" className="space-y-4">
      <span className="sr-only">{label}</span>
      <div className="h-7 w-64 animate-pulse rounded bg-slate-200 dark:bg-slate-700" aria-hidden="true" />
      <Card>
        <div className="h-48 animate-pulse rounded bg-slate-100 dark:bg-slate-800" aria-hidden="true" />
      </Card>
    </div>
  );
}

/** What a screen shows when it failed: the words, and a way to try again. */
export function ScreenError({ what, reset }: { what: string; reset: () => void }) {
  return (
    <Notice tone="error" title={`${what} could not be shown`}>
      <p>Something went wrong on our side; nothing you entered was lost. Try again, and if it keeps failing, tell your workspace admin.</p>
      <Button variant="secondary" size="sm" className="mt-3" onClick={reset}>
        Try again
      </Button>
    </Notice>
  );
}
