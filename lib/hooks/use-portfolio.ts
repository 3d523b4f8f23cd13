"use client";

import useSWR from "swr";
import type { PortfolioRow } from "@/db/queries/portfolio";
import { CAMPAIGN_POLL_MS } from "./use-campaign-status";

export const PORTFOLIO_KEY = "/api/v1/portfolio";

async function fetchPortfolio(url: string): Promise<{ campaigns: PortfolioRow[] }> {
  const response = await fetch(url, { headers: { accept: "application/json" }, cache: "no-store" });
  if (!response.ok) throw new Error(`The portfolio could not be loaded (${response.status}).`);
  return (await response.json()) as { campaigns: PortfolioRow[] };
}

/** Every campaign of the workspace with its call, polled so a new call appears without a reload. */
export function usePortfolio(options: { fallback?: { campaigns: PortfolioRow[] }; refreshInterval?: number } = {}) {
  const refreshInterval = options.refreshInterval ?? CAMPAIGN_POLL_MS;
  return useSWR(PORTFOLIO_KEY, fetchPortfolio, { fallbackData: options.fallback, refreshInterval, dedupingInterval: Math.max(1_000, refreshInterval - 5_000) });
}
