"use client";

import { useRouter } from "next/navigation";
import { useEffect, useRef } from "react";
import { CountsChart, type CountsDay } from "@/components/charts/counts-chart";
import { LiftChart } from "@/components/charts/lift-chart";
import { PeekingCostChart, type PeekingLook } from "@/components/charts/peeking-cost-chart";
import { PValueChart } from "@/components/charts/p-value-chart";
import { Card, CardHeader, Notice } from "@/components/ui";
import type { CallName } from "@/db/schema/campaigns";
import { CALL_ASSUMPTIONS, CALL_WORDS } from "@/lib/alerts/call-words";
import type { CampaignStatus, StatusDay } from "@/lib/campaigns/campaign-status";
import { useSeries } from "@/lib/hooks/use-series";
import { useStatus } from "@/lib/hooks/use-status";
import { CallBadge } from "./call-badge";
import { formatDifference, formatLiftPercent, formatP, formatPoints, formatTimestamp } from "./format";

export interface DashboardCampaign {
  id: string;
  name: string;
  alpha: number;
  metricKind: "conversion" | "mean";
  metricUnit: string | null;
  maxDays: number;
  /** The smallest absolute lift worth having: baseline × relative MDE (from the plan). */
  minimumLiftAbsolute: number | null;
  arms: { key: string; name: string; isHoldout: boolean }[];
}

export interface DashboardHealth {
  /** The anytime-valid SRM test is below the engine's gate (lib/sequential HEALTH_DEFAULTS), decided on the server. */
  srmMismatch: boolean;
  srmGate: number;
  srmChiSquareP: number | null;
  srmSequentialP: number | null;
  revisedDays: { date: string; arm: string; revisedAfterCall: boolean }[];
  planChangedAt: string | null;
  analyzedAt: string | null;
}

/** The live part of the campaign page: call, lift and p-value charts (polled), cost of peeking, counts and data health. */
export function CampaignDashboard({
  campaign,
  initialStatus,
  initialSeries,
  peekingLooks,
  counts,
  health,
  pollMs = 30_000,
}: {
  campaign: DashboardCampaign;
  initialStatus: CampaignStatus;
  initialSeries: StatusDay[];
  peekingLooks: PeekingLook[];
  counts: CountsDay[];
  health: DashboardHealth;
  /** Poll interval of the status and series. */
  pollMs?: number;
}) {
  const router = useRouter();
  const status = useStatus(campaign.id, { fallback: initialStatus, refreshInterval: pollMs });
  const series = useSeries(campaign.id, { fallback: { id: campaign.id, name: campaign.name, days: initialSeries }, refreshInterval: pollMs });
  const current = status.data ?? initialStatus;
  const days = series.data?.days ?? initialSeries;
  const call = (current.call as CallName) ?? "collecting";
  const words = CALL_WORDS[call] ?? CALL_WORDS.collecting;

  // New counts arrived (a new day or call): refresh the server-rendered parts (counts, cost of peeking, history) too.
  const seen = useRef(`${initialStatus.asOf}|${initialStatus.call}|${initialStatus.updatedAt}`);
  useEffect(() => {
    const now = `${current.asOf}|${current.call}|${current.updatedAt}`;
    if (now !== seen.current) {
      seen.current = now;
      router.refresh();
    }
  }, [current.asOf, current.call, current.updatedAt, router]);

  const conversion = campaign.metricKind === "conversion";
  const unit = conversion ? { scale: 100, suffix: " pp", digits: 2 } : { scale: 1, suffix: campaign.metricUnit ? ` ${campaign.metricUnit}` : "", digits: 2 };
  const absolute = conversion ? formatPoints(current.lift.absolute) : formatDifference(current.lift.absolute, campaign.metricUnit);
  const intervalText = (interval: typeof current.lift.cs) =>
    interval ? (conversion ? `${formatPoints(interval[0])} to ${formatPoints(interval[1])}` : `${formatDifference(interval[0], campaign.metricUnit)} to ${formatDifference(interval[1], campaign.metricUnit)}`) : "—";
  const issues = current.health.issues;

  return (
    <div className="space-y-6">
      <Card aria-labelledby="call-title">
        <div className="flex flex-wrap items-start justify-between gap-4">
          <div className="min-w-0 max-w-3xl">
            <h2 id="call-title" className="sr-only">
              The call
            </h2>
            <div className="flex flex-wrap items-center gap-3" aria-live="polite" data-testid="campaign-call">
              <CallBadge call={call} size="lg" />
              <span className="text-lg font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">{words.action}</span>
            </div>
            <p className="mt-2 text-sm">{words.meaning}</p>
            <p className="mt-2 text-xs text-tremor-content dark:text-dark-tremor-content">
              Day {current.daysRun} of at most {campaign.maxDays} · data to {current.asOf ?? "—"} · polled every {Math.round(pollMs / 1000)} s{status.isValidating ? " · refreshing…" : ""} · worker analysis {formatTimestamp(health.analyzedAt)}
            </p>
          </div>
          <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm tabular-nums">
            <dt className="text-tremor-content dark:text-dark-tremor-content">Lift</dt>
            <dd className="text-right font-semibold">
              {formatLiftPercent(current.lift.relative)} <span className="font-normal text-tremor-content dark:text-dark-tremor-content">({absolute})</span>
            </dd>
            <dt className="text-tremor-content dark:text-dark-tremor-content">Always-valid range</dt>
            <dd className="text-right">{intervalText(current.lift.cs)}</dd>
            <dt className="text-tremor-content dark:text-dark-tremor-content">Fixed-horizon interval</dt>
            <dd className="text-right">{intervalText(current.lift.ci)}</dd>
            <dt className="text-tremor-content dark:text-dark-tremor-content">Always-valid p</dt>
            <dd className="text-right">{formatP(current.sequential.p)}</dd>
            <dt className="text-tremor-content dark:text-dark-tremor-content">Naive p (daily peek)</dt>
            <dd className="text-right">{formatP(current.fixed.p)}</dd>
          </dl>
        </div>
        {(current as { stale?: boolean }).stale ? (
          <Notice tone="info" title="New counts are waiting for the worker" className="mt-3">
            Counts or the plan changed after the last analysis; the numbers refresh on the worker&apos;s next pass.
          </Notice>
        ) : null}
        {status.error ? (
          <Notice tone="error" title="Could not refresh">
            The latest status could not be loaded; the numbers shown are the last ones received.
          </Notice>
        ) : null}
        <details className="mt-4 text-sm">
          <summary className="cursor-pointer font-medium">What this call rests on</summary>
          <ul className="mt-2 list-disc space-y-1 pl-5 text-tremor-content dark:text-dark-tremor-content">
            {CALL_ASSUMPTIONS.map((assumption) => (
              <li key={assumption}>{assumption}</li>
            ))}
            <li>Decision support, not a guarantee: read it beside what you know about the campaign.</li>
          </ul>
        </details>
      </Card>

      {days.length === 0 ? (
        <Card>
          <p className="text-sm">No counts yet: the charts appear with the first day of counts for every arm.</p>
        </Card>
      ) : (
        <div className="grid gap-6 xl:grid-cols-2">
          <LiftChart campaignName={campaign.name} days={days} minimumLift={campaign.minimumLiftAbsolute} unit={unit} />
          <PValueChart campaignName={campaign.name} days={days} alpha={campaign.alpha} />
          <PeekingCostChart campaignName={campaign.name} looks={peekingLooks} alpha={campaign.alpha} />
          <CountsChart campaignName={campaign.name} arms={campaign.arms} days={counts} outcomeLabel={conversion ? "conversions" : `sum${campaign.metricUnit ? ` ${campaign.metricUnit}` : ""}`} />
        </div>
      )}

      <Card aria-labelledby="health-title">
        <CardHeader id="health-title" title="Data health" description="No call is made while a check fails. The sample-ratio check compares the units per arm with the planned shares." />
        <dl className="grid gap-x-6 gap-y-2 text-sm sm:grid-cols-2">
          <div className="flex justify-between gap-4">
            <dt>Sample ratio, chi-square test p</dt>
            <dd className="tabular-nums">{formatP(health.srmChiSquareP)}</dd>
          </div>
          <div className="flex justify-between gap-4">
            <dt>Sample ratio, always-valid test p</dt>
            <dd className="tabular-nums">{formatP(current.health.srmP ?? health.srmSequentialP)}</dd>
          </div>
        </dl>
        <p className="mt-2 text-xs text-tremor-content dark:text-dark-tremor-content">
          A mismatch is flagged when the always-valid p falls below {health.srmGate} (common practice, no source). The chi-square p is the classic one-look test.
        </p>
        <ul className="mt-4 space-y-1 text-sm" data-testid="health-issues">
          {health.srmMismatch ? (
            <li>
              <span className="font-medium">Sample-ratio mismatch</span>: the units per arm differ from the planned shares (always-valid p below {health.srmGate}). Check the
              assignment and the pipeline before reading any result.
            </li>
          ) : null}
          {issues.length === 0 && !health.srmMismatch ? <li>No gaps, impossible counts or other problems found.</li> : null}
          {issues.map((issue, index) => (
            <li key={index}>
              <span className="font-medium">{issue.rule}</span>
              {issue.date ? ` on ${issue.date}` : ""} ({issue.arm}): {issue.message}
            </li>
          ))}
          {health.revisedDays.map((revision) => (
            <li key={`${revision.date}-${revision.arm}`}>
              <span className="font-medium">Revised day</span> {revision.date} ({revision.arm}): the pipeline resent it; the old values are kept.
              {revision.revisedAfterCall ? " The change came after a call was made: check that the call still holds." : ""}
            </li>
          ))}
          {health.planChangedAt ? <li><span className="font-medium">Plan changed</span> on {health.planChangedAt.slice(0, 10)} after counts arrived; the reason is in the audit log.</li> : null}
        </ul>
      </Card>
    </div>
  );
}
