import { createHash } from "node:crypto";
import type { Membership } from "@/db/queries/members";

/** A verified session as route handlers keep it in memory, keyed by the hash of its signed cookie. */
export interface CachedSession {
  token: string;
  userId: string;
  email: string;
  activeOrganizationId: string | null;
  expiresAt: number;
  loadedAt: number;
}

/** How long a verified session or a membership is trusted without a database read in this process. */
export const SESSION_CACHE_TTL_MS = 5_000;
/** Bound on cached sessions and on cached memberships per process. */
export const SESSION_CACHE_MAX_ENTRIES = 1_000;

interface SessionCacheState {
  sessions: Map<string, CachedSession>;
  memberships: Map<string, { membership: Membership; loadedAt: number }>;
  // Bumped by every forget: a load that started before it must not store what it read.
  generation: number;
}

// On globalThis: route handlers, server actions and better-auth's hooks are separate bundles in one process.
const globalForSessions = globalThis as unknown as { peeksafeSessionCache?: SessionCacheState };

function state(): SessionCacheState {
  globalForSessions.peeksafeSessionCache ??= { sessions: new Map(), memberships: new Map(), generation: 0 };
  return globalForSessions.peeksafeSessionCache;
}

function remember<V>(map: Map<string, V>, key: string, value: V): void {
  map.delete(key);
  if (map.size >= SESSION_CACHE_MAX_ENTRIES) map.delete(map.keys().next().value as string);
  map.set(key, value);
}

/**
 * The session behind a signed session cookie: from memory when better-auth verified this exact cookie
 * less than SESSION_CACHE_TTL_MS ago, else `load()` (better-auth's lookup). Null for no or an expired session.
 */
export async function getCachedSession(
  signedCookie: string,
  load: () => Promise<Omit<CachedSession, "loadedAt"> | null>,
  now = Date.now(),
): Promise<CachedSession | null> {
  const cache = state();
  const hash = createHash("sha256").update(signedCookie).digest("base64url");
  const hit = cache.sessions.get(hash);
  if (hit && now - hit.loadedAt < SESSION_CACHE_TTL_MS && hit.expiresAt > now) return hit;
  cache.sessions.delete(hash);
  const generation = cache.generation;
  const loaded = await load();
  if (!loaded || loaded.expiresAt <= now) return null;
  const entry = { ...loaded, loadedAt: now };
  // Only a cookie whose own token is the loaded session's is cached (a header with two session cookies is not).
  if (cache.generation === generation && signedCookie.slice(0, signedCookie.lastIndexOf(".")) === loaded.token) remember(cache.sessions, hash, entry);
  return entry;
}

/** The user's membership of a workspace: from memory within SESSION_CACHE_TTL_MS, else `load()`; a non-member is never cached. */
export async function getCachedMembership(
  workspaceId: string,
  userId: string,
  load: () => Promise<Membership | null>,
  now = Date.now(),
): Promise<Membership | null> {
  const cache = state();
  const key = `${workspaceId}:${userId}`;
  const hit = cache.memberships.get(key);
  if (hit && now - hit.loadedAt < SESSION_CACHE_TTL_MS) return hit.membership;
  cache.memberships.delete(key);
  const generation = cache.generation;
  const membership = await load();
  if (membership && cache.generation === generation) remember(cache.memberships, key, { membership, loadedAt: now });
  return membership;
}

/** Forgets one session in this process at once (signed out, revoked, or its active workspace changed). */
export function forgetSession(token: string): void {
  const cache = state();
  cache.generation += 1;
  for (const [hash, entry] of cache.sessions) if (entry.token === token) cache.sessions.delete(hash);
}

/** Forgets every session of a user in this process (the user changed or was deleted). */
export function forgetUserSessions(userId: string): void {
  const cache = state();
  cache.generation += 1;
  for (const [hash, entry] of cache.sessions) if (entry.userId === userId) cache.sessions.delete(hash);
}

/** Forgets every cached membership in this process (any workspace or member change: they are rare). */
export function forgetMemberships(): void {
  const cache = state();
  cache.generation += 1;
  cache.memberships.clear();
}
