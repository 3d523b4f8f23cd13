"use client";

import useSWR from "swr";

export interface SubscriptionState {
  campaignId: string;
  subscribed: boolean;
  reason: "subscribed" | "unsubscribed" | "creator" | "default-recipient" | "none";
}

export interface AnalysisRefresh {
  campaignId: string;
  analyzedAt: string | null;
  countsChangedAt: string | null;
  currentCall: string;
  pending: boolean;
  days: number;
}

async function fetchJson<T>(url: string): Promise<T> {
  const response = await fetch(url, { headers: { accept: "application/json" } });
  if (!response.ok) throw new Error(`${url} answered ${response.status}`);
  return (await response.json()) as T;
}

export function subscriptionKey(campaignId: string): string {
  return `/api/v1/campaigns/${encodeURIComponent(campaignId)}/subscription`;
}

export function refreshKey(campaignId: string): string {
  return `/api/v1/campaigns/${encodeURIComponent(campaignId)}/recompute`;
}

/** The signed-in member's alert subscription for a campaign, with subscribe/unsubscribe actions. */
export function useSubscription(campaignId: string) {
  const key = subscriptionKey(campaignId);
  const swr = useSWR<SubscriptionState>(key, fetchJson);
  const change = async (subscribe: boolean) => {
    const response = await fetch(key, { method: subscribe ? "PUT" : "DELETE", headers: { accept: "application/json" } });
    if (!response.ok) throw new Error(`could not ${subscribe ? "subscribe" : "unsubscribe"} (${response.status})`);
    await swr.mutate((await response.json()) as SubscriptionState, { revalidate: false });
  };
  return { ...swr, subscribe: () => change(true), unsubscribe: () => change(false) };
}

/** When the campaign's analysis was last refreshed (polled), and a way to recompute now for admins and leads. */
export function useAnalysisRefresh(campaignId: string, refreshInterval = 30_000) {
  const key = refreshKey(campaignId);
  const swr = useSWR<AnalysisRefresh>(key, fetchJson, { refreshInterval, dedupingInterval: refreshInterval / 2 });
  const recompute = async () => {
    const response = await fetch(key, { method: "POST", headers: { accept: "application/json" } });
    if (!response.ok) throw new Error(`could not recompute (${response.status})`);
    await swr.mutate();
  };
  return { ...swr, recompute };
}
