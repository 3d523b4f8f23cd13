import { getKeyUsage } from "@/db/queries/ingest-batches";
import { API_KEY_REQUESTS_PER_MINUTE } from "@/lib/auth/create-auth";

/** The key's quota as an IETF RateLimit-Policy (draft-ietf-httpapi-ratelimit-headers). */
export const RATE_LIMIT_POLICY = `"per-key";q=${API_KEY_REQUESTS_PER_MINUTE};w=60`;

/** `RateLimit` for the key that just made a request: requests left in its window and seconds to the window's end. */
export async function rateLimitHeaders(keyId: string, now: number = Date.now()): Promise<Record<string, string>> {
  const usage = await getKeyUsage(keyId);
  if (!usage) return {};
  const max = usage.max ?? API_KEY_REQUESTS_PER_MINUTE;
  const windowMs = usage.windowMs ?? 60_000;
  const last = usage.lastRequest?.getTime() ?? now;
  const reset = Math.max(0, Math.ceil((last + windowMs - now) / 1000));
  const remaining = Math.max(0, max - (usage.requestCount ?? 0));
  return { ratelimit: `"per-key";r=${remaining};t=${reset}`, "ratelimit-policy": `"per-key";q=${max};w=${Math.round(windowMs / 1000)}` };
}
