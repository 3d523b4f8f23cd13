import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { parsePermissions } from "@/db/queries/api-keys";
import { apikeys } from "@/db/schema";

/** A verified API key as the read path keeps it in memory: never the key itself, only its hash as the map key. */
export interface CachedApiKey {
  id: string;
  workspaceId: string;
  permissions: Record<string, string[]>;
  expiresAt: Date | null;
  rateLimit: { max: number; windowMs: number } | null;
  loadedAt: number;
}

/** How long a verified key is trusted without a database read; revocation through our API forgets it at once. */
export const KEY_CACHE_TTL_MS = 5_000;
/** Bound on cached keys and rate-limit windows per process. */
export const KEY_CACHE_MAX_ENTRIES = 1_000;

interface KeyCacheState {
  byHash: Map<string, CachedApiKey>;
  windows: Map<string, { startedAt: number; count: number }>;
  // Bumped by every forget: a verification that started before a revocation must not store what it read.
  generation: number;
}

// On globalThis: route handlers and server actions are separate bundles in one process and must share one cache.
const globalForKeys = globalThis as unknown as { peeksafeKeyCache?: KeyCacheState };

function state(): KeyCacheState {
  globalForKeys.peeksafeKeyCache ??= { byHash: new Map(), windows: new Map(), generation: 0 };
  return globalForKeys.peeksafeKeyCache;
}

/** The stored form of a key: SHA-256, base64url without padding (the api-key plugin's own hashing). */
export function hashApiKey(key: string): string {
  return createHash("sha256").update(key).digest("base64url");
}

async function loadKey(hash: string, now: number): Promise<CachedApiKey | null> {
  const [row] = await getDb()
    .select({
      id: apikeys.id,
      workspaceId: apikeys.referenceId,
      enabled: apikeys.enabled,
      expiresAt: apikeys.expiresAt,
      permissions: apikeys.permissions,
      rateLimitEnabled: apikeys.rateLimitEnabled,
      rateLimitMax: apikeys.rateLimitMax,
      rateLimitTimeWindow: apikeys.rateLimitTimeWindow,
    })
    .from(apikeys)
    .where(eq(apikeys.key, hash))
    .limit(1);
  if (!row || row.enabled === false) return null;
  // Keeps "last used" on the settings screen within one cache lifetime without a write per request.
  void getDb().update(apikeys).set({ lastRequest: new Date(now) }).where(eq(apikeys.id, row.id)).catch(() => undefined);
  return {
    id: row.id,
    workspaceId: row.workspaceId,
    permissions: parsePermissions(row.permissions),
    expiresAt: row.expiresAt,
    rateLimit: row.rateLimitEnabled === false ? null : { max: row.rateLimitMax ?? 600, windowMs: row.rateLimitTimeWindow ?? 60_000 },
    loadedAt: now,
  };
}

function remember<V>(map: Map<string, V>, key: string, value: V): void {
  map.delete(key);
  if (map.size >= KEY_CACHE_MAX_ENTRIES) map.delete(map.keys().next().value as string);
  map.set(key, value);
}

/**
 * Verifies a key for read-only calls: from memory when verified less than KEY_CACHE_TTL_MS ago, else one
 * indexed read by hash. Null for unknown, revoked (disabled) or expired keys.
 */
export async function verifyCachedKey(key: string, now = Date.now()): Promise<CachedApiKey | null> {
  const cache = state();
  const { byHash } = cache;
  const hash = hashApiKey(key);
  let entry = byHash.get(hash);
  if (!entry || now - entry.loadedAt >= KEY_CACHE_TTL_MS) {
    byHash.delete(hash);
    const generation = cache.generation;
    const loaded = await loadKey(hash, now);
    if (!loaded) return null;
    if (cache.generation === generation) remember(byHash, hash, loaded);
    entry = loaded;
  }
  if (entry.expiresAt && entry.expiresAt.getTime() <= now) return null;
  return entry;
}

/**
 * Counts one call in the key's fixed window (in this process); returns the milliseconds to wait when it
 * is over the limit, else null.
 */
export function takeKeyRequest(entry: CachedApiKey, now = Date.now()): number | null {
  if (!entry.rateLimit) return null;
  const { windows } = state();
  let window = windows.get(entry.id);
  if (!window || now - window.startedAt >= entry.rateLimit.windowMs) {
    window = { startedAt: now, count: 0 };
    remember(windows, entry.id, window);
  }
  if (window.count >= entry.rateLimit.max) return window.startedAt + entry.rateLimit.windowMs - now;
  window.count += 1;
  return null;
}

/** Forgets a key in this process at once (called when it is revoked). */
export function forgetApiKey(keyId: string): void {
  const cache = state();
  cache.generation += 1;
  const { byHash } = cache;
  for (const [hash, entry] of byHash) if (entry.id === keyId) byHash.delete(hash);
}
