import { CALL_WORDS } from "@/lib/alerts/call-words";
import type { CallName } from "@/db/schema/campaigns";
import { cn } from "@/components/ui/cn";

const TONES: Record<CallName, string> = {
  lift: "border-pine-400 bg-pine-50 text-pine-900 dark:border-pine-600 dark:bg-pine-950 dark:text-pine-100",
  harm: "border-red-400 bg-red-50 text-red-900 dark:border-red-700 dark:bg-red-950 dark:text-red-100",
  flat: "border-slate-400 bg-slate-50 text-slate-800 dark:border-slate-500 dark:bg-slate-800 dark:text-slate-100",
  horizon: "border-sky-400 bg-sky-50 text-sky-900 dark:border-sky-700 dark:bg-sky-950 dark:text-sky-100",
  suspect: "border-amber-400 bg-amber-50 text-amber-900 dark:border-amber-600 dark:bg-amber-950 dark:text-amber-100",
  collecting: "border-slate-300 bg-white text-slate-700 dark:border-slate-600 dark:bg-slate-900 dark:text-slate-200",
};

/** One small drawn sign per call, so the call reads without colour and without words alike. */
function CallIcon({ call }: { call: CallName }) {
  const common = { width: 14, height: 14, viewBox: "0 0 16 16", fill: "none", stroke: "currentColor", strokeWidth: 1.8, strokeLinecap: "round" as const, strokeLinejoin: "round" as const, "aria-hidden": true };
  switch (call) {
    case "lift":
      return <svg {...common}><path d="M3 11l4-4 2.5 2.5L13 5" /><path d="M9.5 5H13v3.5" /></svg>;
    case "harm":
      return <svg {...common}><path d="M3 5l4 4 2.5-2.5L13 11" /><path d="M9.5 11H13V7.5" /></svg>;
    case "flat":
      return <svg {...common}><path d="M3 8h10" /><path d="M10 5l3 3-3 3" /></svg>;
    case "horizon":
      return <svg {...common}><path d="M2 11h12" /><path d="M5 11a3 3 0 016 0" /><path d="M8 3v2" /></svg>;
    case "suspect":
      return <svg {...common}><path d="M8 2l6.5 11.5h-13z" /><path d="M8 6.5v3" /><path d="M8 11.8v.2" /></svg>;
    default:
      return <svg {...common}><circle cx="8" cy="8" r="5.5" /><path d="M8 5v3l2 1.5" /></svg>;
  }
}

/** A call as words with its icon; the tone only reinforces it. */
export function CallBadge({ call, size = "sm", className }: { call: CallName; size?: "sm" | "lg"; className?: string }) {
  const words = CALL_WORDS[call] ?? CALL_WORDS.collecting;
  return (
    <span
      data-call={call}
      className={cn(
        "inline-flex items-center gap-1.5 whitespace-nowrap rounded-full border font-medium",
        size === "lg" ? "px-3 py-1 text-sm" : "px-2 py-0.5 text-xs",
        TONES[call] ?? TONES.collecting,
        className,
      )}
    >
      <CallIcon call={call} />
      {words.phrase}
    </span>
  );
}
