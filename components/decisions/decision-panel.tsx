"use client";

import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import useSWR from "swr";
import { CallBadge } from "@/components/dashboard/call-badge";
import { formatTimestamp } from "@/components/dashboard/format";
import { Button, Card, CardHeader, EmptyState, Notice, controlClasses } from "@/components/ui";
import type { AlertHistoryDto, DecisionDto } from "@/db/queries/decisions";
import type { DecisionOutcome } from "@/db/schema/decisions";
import { CALL_WORDS } from "@/lib/alerts/call-words";
import { DECISION_CHOICES, DECISION_LABELS, ENDING_OUTCOMES } from "@/lib/decision-words";

export interface DecisionHistory {
  campaignId: string;
  status: string;
  decisions: DecisionDto[];
  alerts: AlertHistoryDto[];
}

const decisionsKey = (campaignId: string) => `/api/v1/campaigns/${campaignId}/decisions`;

async function fetchHistory(url: string): Promise<DecisionHistory> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`The decision history could not be loaded (${response.status}).`);
  return (await response.json()) as DecisionHistory;
}

const OUTCOME_HELP: Record<DecisionOutcome, string> = {
  ship: "Roll the campaign out to everyone; the campaign ends.",
  roll_back: "Take the campaign back; the campaign ends.",
  extend: "Keep it running to collect more evidence.",
  stop: "End the campaign without shipping it.",
};

/** The decision form (leads and admins) and the history of decisions and alerts (everyone). */
export function DecisionPanel({ campaignId, canDecide, initial }: { campaignId: string; canDecide: boolean; initial: DecisionHistory }) {
  const router = useRouter();
  const { data, mutate } = useSWR(decisionsKey(campaignId), fetchHistory, { fallbackData: initial, refreshInterval: 60_000 });
  const [outcome, setOutcome] = useState<DecisionOutcome>("extend");
  const [note, setNote] = useState("");
  const [pending, setPending] = useState(false);
  const [problem, setProblem] = useState<{ message: string; fields: Record<string, string> } | null>(null);
  const [recorded, setRecorded] = useState<string | null>(null);
  // A server refresh (new counts, a new call) brings a new `initial`: take it over.
  useEffect(() => {
    void mutate(initial, { revalidate: false });
  }, [initial, mutate]);
  const history = data ?? initial;
  const open = history.status === "running" || history.status === "paused";

  const submit = async (event: React.FormEvent) => {
    event.preventDefault();
    setPending(true);
    setProblem(null);
    setRecorded(null);
    try {
      const response = await fetch(decisionsKey(campaignId), { method: "POST", headers: { "content-type": "application/json", accept: "application/json" }, body: JSON.stringify({ outcome, note }) });
      const body = (await response.json().catch(() => ({}))) as { detail?: string; errors?: { pointer?: string; message: string }[] };
      if (!response.ok) {
        const fields = Object.fromEntries((body.errors ?? []).map((error) => [(error.pointer ?? "").replace(/^\//, ""), error.message]));
        setProblem({ message: body.detail ?? `The decision was not recorded (${response.status}).`, fields });
        return;
      }
      setNote("");
      setRecorded(`${DECISION_LABELS[outcome]} recorded.`);
      await mutate();
      router.refresh();
    } finally {
      setPending(false);
    }
  };

  return (
    <Card aria-labelledby="decision-title">
      <CardHeader id="decision-title" title="Decision" description="The growth lead records the final call with a note; every decision and alert stays listed here." />
      {recorded ? (
        <p role="status" className="mb-3 text-sm font-medium text-pine-800 dark:text-pine-300">
          {recorded}
        </p>
      ) : null}
      {canDecide && open ? (
        <form onSubmit={submit} className="mb-6 space-y-3" aria-describedby="decision-help" data-testid="decision-form">
          <fieldset>
            <legend className="mb-2 text-sm font-medium">Decision</legend>
            <div className="grid gap-2 sm:grid-cols-2">
              {DECISION_CHOICES.map((value) => (
                <label key={value} className="flex cursor-pointer items-start gap-2 rounded-tremor-default border border-tremor-border p-2 text-sm dark:border-dark-tremor-border">
                  <input type="radio" name="outcome" value={value} checked={outcome === value} onChange={() => setOutcome(value)} className="mt-0.5 text-pine-700 focus:ring-pine-500" />
                  <span>
                    <span className="font-medium">{DECISION_LABELS[value]}</span>
                    <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">{OUTCOME_HELP[value]}</span>
                  </span>
                </label>
              ))}
            </div>
          </fieldset>
          <label className="block text-sm">
            <span className="mb-1 block font-medium">Note</span>
            <textarea
              name="note"
              required
              minLength={10}
              rows={3}
              value={note}
              onChange={(event) => setNote(event.target.value)}
              aria-invalid={problem?.fields.note ? true : undefined}
              aria-describedby="decision-help"
              className={controlClasses}
            />
            <span id="decision-help" className="mt-1 block text-xs text-tremor-content dark:text-dark-tremor-content">
              Why, in at least 10 characters. {ENDING_OUTCOMES.includes(outcome) ? "This ends the campaign." : "The campaign keeps running."}
            </span>
          </label>
          {problem ? (
            <Notice tone="error" title="Not recorded">
              {problem.message} {Object.values(problem.fields).join(" ")}
            </Notice>
          ) : null}
          <Button type="submit" pending={pending}>
            Record decision
          </Button>
        </form>
      ) : canDecide ? (
        <p className="mb-4 text-sm text-tremor-content dark:text-dark-tremor-content">This campaign is {history.status}; decisions are recorded while it runs or is paused.</p>
      ) : null}
      <h3 className="mb-2 text-sm font-semibold">History</h3>
      {history.decisions.length === 0 && history.alerts.length === 0 ? (
        <EmptyState title="Nothing yet" description="Alerts appear when the call changes; decisions when a lead records one." />
      ) : (
        <ol className="space-y-2 text-sm" data-testid="decision-history">
          {[
            ...history.decisions.map((decision) => ({ at: decision.createdAt, key: `d-${decision.id}`, node: (
              <>
                <span className="font-medium">{DECISION_LABELS[decision.outcome]}</span> by {decision.decidedBy.name ?? "a former member"} while the call was “{CALL_WORDS[decision.callAtDecision].phrase}”: {decision.note}
              </>
            ) })),
            ...history.alerts.map((alert) => ({ at: alert.createdAt, key: `a-${alert.id}`, node: (
              <>
                Alert: <CallBadge call={alert.kind} /> on {alert.day} (was “{CALL_WORDS[alert.fromCall].phrase}”) · {alert.sentAt ? "mailed" : alert.lastError ? `not mailed yet: ${alert.lastError}` : "queued"}
              </>
            ) })),
          ]
            .sort((a, b) => b.at.localeCompare(a.at))
            .map((entry) => (
              <li key={entry.key} className="border-b border-tremor-border pb-2 dark:border-dark-tremor-border">
                <span className="mr-2 text-xs tabular-nums text-tremor-content dark:text-dark-tremor-content">{formatTimestamp(entry.at)}</span>
                {entry.node}
              </li>
            ))}
        </ol>
      )}
    </Card>
  );
}
