"use client";

import useSWR from "swr";
import type { CampaignStatus } from "@/lib/campaigns/campaign-status";
import { CAMPAIGN_POLL_MS, campaignStatusKey } from "./use-campaign-status";

async function fetchStatus(url: string): Promise<CampaignStatus> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`The campaign status could not be loaded (${response.status}).`);
  return (await response.json()) as CampaignStatus;
}

/** The campaign's latest call and statistics, seeded by the server render and polled (GET /api/v1/campaigns/:id/status). */
export function useStatus(campaignId: string, options: { fallback?: CampaignStatus; refreshInterval?: number } = {}) {
  const refreshInterval = options.refreshInterval ?? CAMPAIGN_POLL_MS;
  return useSWR(campaignStatusKey(campaignId), fetchStatus, { fallbackData: options.fallback, refreshInterval, dedupingInterval: Math.max(1_000, refreshInterval - 5_000) });
}
