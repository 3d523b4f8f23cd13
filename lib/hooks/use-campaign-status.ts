"use client";

import useSWR from "swr";
import type { CampaignStatus, StatusDay } from "@/lib/campaigns/campaign-status";

import { CAMPAIGN_POLL_MS, campaignSeriesKey, campaignStatusKey } from "./campaign-keys";

export { CAMPAIGN_POLL_MS, campaignSeriesKey, campaignStatusKey };

async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`${url} answered ${response.status}.`);
  return (await response.json()) as T;
}

const options = { refreshInterval: CAMPAIGN_POLL_MS, dedupingInterval: CAMPAIGN_POLL_MS - 5_000 };

/** The campaign's latest call and statistics (GET /api/v1/campaigns/:id/status), polled. */
export function useCampaignStatus(campaignId: string) {
  return useSWR(campaignStatusKey(campaignId), fetchJson<CampaignStatus>, options);
}

/** The campaign's day-by-day series (GET /api/v1/campaigns/:id/series), polled. */
export function useCampaignSeries(campaignId: string) {
  return useSWR(campaignSeriesKey(campaignId), fetchJson<{ id: string; name: string; days: StatusDay[] }>, options);
}
