"use client";

import { DataTable } from "@/components/dashboard/data-table";
import Link from "next/link";
import { useMemo, useState } from "react";
import { Sparkline } from "@/components/charts/sparkline";
import { Badge, Card, EmptyState, Notice, Select, Td, Th, buttonClasses, controlClasses } from "@/components/ui";
import type { PortfolioRow } from "@/db/queries/portfolio";
import type { CallName, CampaignStatus } from "@/db/schema/campaigns";
import { CALL_WORDS } from "@/lib/alerts/call-words";
import { STATUS_LABELS } from "@/lib/campaigns/lifecycle";
import { usePortfolio } from "@/lib/hooks/use-portfolio";
import { CallBadge } from "./call-badge";
import { DownloadCsvButton } from "./download-csv-button";
import { formatInterval, formatLiftPercent, formatP, formatTimestamp } from "./format";

type SortKey = "name" | "call" | "daysRun" | "lift" | "sequentialP" | "analyzedAt";

const SORTS: { key: SortKey; label: string }[] = [
  { key: "call", label: "Call (most urgent first)" },
  { key: "name", label: "Name" },
  { key: "daysRun", label: "Days run" },
  { key: "lift", label: "Lift" },
  { key: "sequentialP", label: "Always-valid p" },
  { key: "analyzedAt", label: "Last refresh" },
];

/** Calls that ask for a decision first. */
const CALL_URGENCY: Record<CallName, number> = { suspect: 0, harm: 1, lift: 2, flat: 3, horizon: 4, collecting: 5 };

const CALL_CHOICES = Object.keys(CALL_URGENCY) as CallName[];
const STATUS_CHOICES = Object.keys(STATUS_LABELS) as CampaignStatus[];

function compare(sort: SortKey) {
  const nullsLast = (a: number | null, b: number | null) => (a === null ? (b === null ? 0 : 1) : b === null ? -1 : a - b);
  return (a: PortfolioRow, b: PortfolioRow): number => {
    switch (sort) {
      case "name":
        return a.name.localeCompare(b.name);
      case "call":
        return CALL_URGENCY[a.call] - CALL_URGENCY[b.call] || a.name.localeCompare(b.name);
      case "daysRun":
        return nullsLast(b.daysRun, a.daysRun);
      case "lift":
        return nullsLast(b.liftRelative, a.liftRelative);
      case "sequentialP":
        return nullsLast(a.sequentialP, b.sequentialP);
      case "analyzedAt":
        return (b.analyzedAt ?? "").localeCompare(a.analyzedAt ?? "");
    }
  };
}

/** The workspace's campaigns with their calls, polled; filter by status and call, sort and search. */
export function Portfolio({ initial, canCreate, refreshInterval }: { initial: PortfolioRow[]; canCreate: boolean; refreshInterval?: number }) {
  const { data, error, isValidating } = usePortfolio({ fallback: { campaigns: initial }, refreshInterval });
  const [status, setStatus] = useState<CampaignStatus | "all">("all");
  const [call, setCall] = useState<CallName | "all">("all");
  const [sort, setSort] = useState<SortKey>("call");
  const [query, setQuery] = useState("");
  const campaigns = useMemo(() => data?.campaigns ?? [], [data]);
  const shown = useMemo(() => {
    const needle = query.trim().toLowerCase();
    return campaigns
      .filter((row) => (status === "all" || row.status === status) && (call === "all" || row.call === call))
      .filter((row) => needle === "" || row.name.toLowerCase().includes(needle) || row.metricName.toLowerCase().includes(needle) || row.slug.includes(needle))
      .sort(compare(sort));
  }, [campaigns, status, call, sort, query]);

  if (campaigns.length === 0) {
    return (
      <Card>
        <EmptyState
          title="No campaigns yet"
          description={
            <>
              Register your first campaign with its holdout plan, then connect your pipeline: create an API key in Settings and send each day&apos;s units and
              conversions per arm to <code>POST /api/v1/ingest</code> (see the API page), or upload a CSV on the campaign page. Calls appear here as soon as the
              first counts are analysed.
            </>
          }
          action={
            <div className="flex flex-wrap justify-center gap-2">
              {canCreate ? (
                <Link href="/campaigns/new" className={buttonClasses()}>
                  Register a campaign
                </Link>
              ) : null}
              <Link href="/docs/api" className={buttonClasses("secondary")}>
                Connect the pipeline
              </Link>
            </div>
          }
        />
      </Card>
    );
  }

  const needsDecision = campaigns.filter((row) => row.status === "running" && row.call !== "collecting").length;
  return (
    <div className="space-y-4">
      <p className="text-sm text-tremor-content dark:text-dark-tremor-content" aria-live="polite">
        {campaigns.length} {campaigns.length === 1 ? "campaign" : "campaigns"} · {needsDecision} running with a call to act on{isValidating ? " · refreshing…" : ""}
      </p>
      {error ? <Notice tone="error" title="Could not refresh">{error instanceof Error ? error.message : "The portfolio could not be loaded."} The numbers below are the last ones received.</Notice> : null}
      <form role="search" aria-label="Filter campaigns" className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4" onSubmit={(event) => event.preventDefault()}>
        <label className="text-sm">
          <span className="mb-1 block font-medium">Search</span>
          <input type="search" value={query} onChange={(event) => setQuery(event.target.value)} placeholder="Name or metric" className={controlClasses} />
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-medium">Status</span>
          <Select value={status} onChange={(event) => setStatus(event.target.value as CampaignStatus | "all")}>
            <option value="all">Every status</option>
            {STATUS_CHOICES.map((value) => (
              <option key={value} value={value}>
                {STATUS_LABELS[value]}
              </option>
            ))}
          </Select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-medium">Call</span>
          <Select value={call} onChange={(event) => setCall(event.target.value as CallName | "all")}>
            <option value="all">Every call</option>
            {CALL_CHOICES.map((value) => (
              <option key={value} value={value}>
                {CALL_WORDS[value].phrase}
              </option>
            ))}
          </Select>
        </label>
        <label className="text-sm">
          <span className="mb-1 block font-medium">Sort by</span>
          <Select value={sort} onChange={(event) => setSort(event.target.value as SortKey)}>
            {SORTS.map((option) => (
              <option key={option.key} value={option.key}>
                {option.label}
              </option>
            ))}
          </Select>
        </label>
      </form>
      <Card>
        <div className="mb-3 flex justify-end">
          <DownloadCsvButton
            label="Download CSV"
            fileParts={["portfolio"]}
            header={["campaign", "status", "call", "days_run", "max_days", "relative_lift", "sequence_low", "sequence_high", "always_valid_p", "naive_p", "as_of", "last_refresh"]}
            rows={shown.map((row) => [row.name, row.status, row.call, row.daysRun, row.maxDays, row.liftRelative, row.relativeSequence?.[0], row.relativeSequence?.[1], row.sequentialP, row.naiveP, row.asOf, row.analyzedAt])}
          />
        </div>
        {shown.length === 0 ? (
          <EmptyState title="No campaign matches" description="Change the search or the filters." />
        ) : (
          <DataTable caption="Campaigns with their calls" className="min-w-[60rem]">
            <thead>
              <tr>
                <Th>Campaign</Th>
                <Th>Call</Th>
                <Th>Status</Th>
                <Th numeric>Days run</Th>
                <Th numeric>Lift (always-valid range)</Th>
                <Th numeric>Always-valid p</Th>
                <Th numeric>Naive p</Th>
                <Th>Trend</Th>
                <Th>Last refresh</Th>
              </tr>
            </thead>
            <tbody>
              {shown.map((row) => (
                <tr key={row.id} data-campaign={row.slug}>
                  <Td>
                    <Link href={`/campaigns/${row.id}`} className="font-medium text-pine-800 hover:underline dark:text-pine-300">
                      {row.name}
                    </Link>
                    <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">{row.metricName}</span>
                  </Td>
                  <Td>
                    <CallBadge call={row.call} />
                  </Td>
                  <Td>
                    <Badge>{STATUS_LABELS[row.status]}</Badge>
                  </Td>
                  <Td numeric>
                    {row.daysRun ?? 0} of {row.maxDays} d
                  </Td>
                  <Td numeric>
                    <span className="font-medium">{formatLiftPercent(row.liftRelative)}</span>
                    <span className="block text-xs text-tremor-content dark:text-dark-tremor-content">{formatInterval(row.relativeSequence)}</span>
                  </Td>
                  <Td numeric>{formatP(row.sequentialP)}</Td>
                  <Td numeric>{formatP(row.naiveP)}</Td>
                  <Td>
                    <Sparkline values={row.trend} />
                    <span className="sr-only">Relative lift over the last {row.trend.length} days</span>
                  </Td>
                  <Td className="whitespace-nowrap text-xs">{formatTimestamp(row.analyzedAt)}</Td>
                </tr>
              ))}
            </tbody>
          </DataTable>
        )}
      </Card>
    </div>
  );
}
