"use client";

import { useState } from "react";
import { useAnalysisRefresh, useSubscription, type SubscriptionState } from "@/lib/hooks/use-subscription";

const REASONS: Record<SubscriptionState["reason"], string> = {
  subscribed: "You follow this campaign.",
  unsubscribed: "You turned its alerts off.",
  creator: "You created this campaign, so you get its alerts.",
  "default-recipient": "Your role gets every campaign's alerts in this workspace.",
  none: "You do not get its alerts.",
};

function formatWhen(iso: string | null): string {
  if (!iso) return "not analysed yet";
  return new Intl.DateTimeFormat(undefined, { dateStyle: "medium", timeStyle: "short" }).format(new Date(iso));
}

/**
 * The campaign page's "last refreshed" line (polled) with a "Recompute now" button for admins and
 * leads (`canRecompute`; the server checks the role again), and the member's own alert toggle.
 */
export function RefreshAndSubscribe({ campaignId, canRecompute }: { campaignId: string; canRecompute: boolean }) {
  const refresh = useAnalysisRefresh(campaignId);
  const subscription = useSubscription(campaignId);
  const [busy, setBusy] = useState<"recompute" | "subscription" | null>(null);
  const [problem, setProblem] = useState<string | null>(null);

  const run = async (what: "recompute" | "subscription", action: () => Promise<void>) => {
    setBusy(what);
    setProblem(null);
    try {
      await action();
    } catch (error) {
      setProblem(error instanceof Error ? error.message : String(error));
    } finally {
      setBusy(null);
    }
  };

  const state = subscription.data;
  return (
    <section aria-label="Analysis refresh and alerts" className="flex flex-wrap items-center gap-x-6 gap-y-2 text-sm text-slate-700 dark:text-slate-200">
      <p>
        <span className="font-medium text-slate-900 dark:text-slate-50">Last refreshed:</span>{" "}
        <time dateTime={refresh.data?.analyzedAt ?? undefined}>{refresh.data ? formatWhen(refresh.data.analyzedAt) : "…"}</time>
        {refresh.data?.pending ? <span className="ml-2 text-slate-600 dark:text-slate-300">(new counts waiting for the next pass)</span> : null}
      </p>
      {canRecompute ? (
        <button
          type="button"
          onClick={() => run("recompute", refresh.recompute)}
          disabled={busy !== null}
          className="rounded-md border border-slate-300 px-3 py-1.5 font-medium text-slate-800 hover:bg-slate-50 disabled:opacity-60 dark:border-slate-500 dark:text-slate-100 dark:hover:bg-slate-800"
        >
          {busy === "recompute" ? "Recomputing…" : "Recompute now"}
        </button>
      ) : null}
      {state ? (
        <label className="inline-flex items-center gap-2">
          <input
            type="checkbox"
            className="rounded border-slate-400 text-pine-700 focus:ring-pine-500"
            checked={state.subscribed}
            disabled={busy !== null}
            onChange={(event) => run("subscription", event.target.checked ? subscription.subscribe : subscription.unsubscribe)}
          />
          <span>
            <span className="font-medium text-slate-900 dark:text-slate-50">E-mail me when the call changes</span>
            <span className="block text-xs text-slate-600 dark:text-slate-300">{REASONS[state.reason]}</span>
          </span>
        </label>
      ) : null}
      {problem ? (
        <p role="alert" className="w-full text-sm text-red-700 dark:text-red-300">
          {problem}
        </p>
      ) : null}
    </section>
  );
}
