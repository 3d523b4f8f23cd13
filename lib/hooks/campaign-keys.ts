// SWR keys of a campaign's live data. Not a client module: the server page seeds SWRConfig fallback under the same keys.

/** How often campaign screens poll their status. */
export const CAMPAIGN_POLL_MS = 30_000;

export const campaignStatusKey = (campaignId: string) => `/api/v1/campaigns/${campaignId}/status`;
export const campaignSeriesKey = (campaignId: string) => `/api/v1/campaigns/${campaignId}/series`;
