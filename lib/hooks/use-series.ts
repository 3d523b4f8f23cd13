"use client";

import useSWR from "swr";
import type { StatusDay } from "@/lib/campaigns/campaign-status";
import { CAMPAIGN_POLL_MS, campaignSeriesKey } from "./use-campaign-status";

export interface CampaignSeries {
  id: string;
  name: string;
  days: StatusDay[];
}

async function fetchSeries(url: string): Promise<CampaignSeries> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`The campaign series could not be loaded (${response.status}).`);
  return (await response.json()) as CampaignSeries;
}

/** The campaign's day-by-day series, seeded by the server render and polled (GET /api/v1/campaigns/:id/series). */
export function useSeries(campaignId: string, options: { fallback?: CampaignSeries; refreshInterval?: number } = {}) {
  const refreshInterval = options.refreshInterval ?? CAMPAIGN_POLL_MS;
  return useSWR(campaignSeriesKey(campaignId), fetchSeries, { fallbackData: options.fallback, refreshInterval, dedupingInterval: Math.max(1_000, refreshInterval - 5_000) });
}
