import type { ReactNode } from "react";
import { cn } from "./cn";

export type NoticeTone = "info" | "success" | "warning" | "error";

const tones: Record<NoticeTone, { box: string; word: string }> = {
  info: { box: "border-slate-300 bg-slate-50 text-slate-800 dark:border-slate-600 dark:bg-slate-900 dark:text-slate-100", word: "Note" },
  success: { box: "border-pine-300 bg-pine-50 text-pine-900 dark:border-pine-700 dark:bg-pine-950 dark:text-pine-100", word: "Done" },
  warning: { box: "border-amber-300 bg-amber-50 text-amber-900 dark:border-amber-700 dark:bg-amber-950 dark:text-amber-100", word: "Careful" },
  error: { box: "border-red-300 bg-red-50 text-red-900 dark:border-red-700 dark:bg-red-950 dark:text-red-100", word: "Error" },
};

/** A message box that starts with a word (Note, Done, Careful, Error) so colour is never the only signal. */
export function Notice({ tone = "info", title, children, className }: { tone?: NoticeTone; title?: string; children?: ReactNode; className?: string }) {
  const style = tones[tone];
  return (
    <div role={tone === "error" ? "alert" : "status"} className={cn("rounded-tremor-default border px-4 py-3 text-sm", style.box, className)}>
      <p className="font-semibold">
        {style.word}
        {title ? `: ${title}` : null}
      </p>
      {children ? <div className="mt-1 leading-relaxed">{children}</div> : null}
    </div>
  );
}
