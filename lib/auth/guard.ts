import { getPool } from "@/db";
import { getMembership } from "@/db/queries/members";
import { getEnv } from "@/lib/env";
import { ForbiddenError, RateLimitedError, UnauthorizedError } from "@/lib/errors";
import { takeKeyRequest, verifyCachedKey } from "./key-cache";
import { roleAllows, type Permission } from "./permissions";
import { getAuth } from "./server";
import { getCachedMembership, getCachedSession, type CachedSession } from "./session-cache";

/** Who is calling a route handler: a signed-in member, or a workspace's pipeline key. */
export type Caller =
  | { kind: "user"; userId: string; email: string; workspaceId: string; role: string }
  | { kind: "key"; keyId: string; workspaceId: string; permissions: Record<string, string[]> };

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

function bearerKey(request: Request): string | null {
  const header = request.headers.get("authorization");
  if (header?.toLowerCase().startsWith("bearer ")) return header.slice(7).trim() || null;
  return request.headers.get("x-api-key");
}

function keyAllows(granted: Record<string, string[]>, permission: Permission): boolean {
  return Object.entries(permission).every(([resource, actions]) =>
    (actions ?? []).every((action) => granted[resource]?.includes(action) ?? false),
  );
}

// Reads (status polling) skip the plugin's verify-and-update per call: a cached verification and an in-process limiter.
async function authorizeReadKey(key: string, permission: Permission): Promise<Caller> {
  const entry = await verifyCachedKey(key);
  if (!entry) throw new UnauthorizedError("The API key is missing, unknown or revoked.");
  if (!keyAllows(entry.permissions, permission)) throw new ForbiddenError("This API key does not carry the permission this route needs.");
  const waitMs = takeKeyRequest(entry);
  if (waitMs !== null) throw new RateLimitedError("This API key sent too many requests.", Math.max(1, Math.ceil(waitMs / 1000)));
  return { kind: "key", keyId: entry.id, workspaceId: entry.workspaceId, permissions: entry.permissions };
}

async function authorizeKey(key: string, permission: Permission): Promise<Caller> {
  const result = await getAuth().api.verifyApiKey({ body: { key } });
  if (!result.valid || !result.key) {
    const code = result.error?.code;
    if (code === "RATE_LIMITED") {
      const details = (result.error as { details?: { tryAgainIn?: number } }).details;
      throw new RateLimitedError("This API key sent too many requests.", Math.max(1, Math.ceil((details?.tryAgainIn ?? 1000) / 1000)));
    }
    // better-auth answers "invalid" when its lookup fails too; a database that is down must be a 503, not a 401.
    await getPool().query("select 1");
    throw new UnauthorizedError("The API key is missing, unknown or revoked.");
  }
  const granted = (result.key.permissions ?? {}) as Record<string, string[]>;
  if (!keyAllows(granted, permission)) throw new ForbiddenError("This API key does not carry the permission this route needs.");
  return { kind: "key", keyId: result.key.id, workspaceId: result.key.referenceId, permissions: granted };
}

/**
 * Authorizes a route handler call: an API key (Bearer or x-api-key) when `allowKey` is set, else the
 * session cookie. State-changing calls with a cookie must come from our own origin (CSRF).
 */
export async function authorizeRequest(
  request: Request,
  permission: Permission,
  options: { allowKey?: boolean; workspaceId?: string } = {},
): Promise<Caller> {
  const key = bearerKey(request);
  if (key) {
    if (!options.allowKey) throw new ForbiddenError("This route does not accept API keys; sign in instead.");
    const caller = SAFE_METHODS.has(request.method) ? await authorizeReadKey(key, permission) : await authorizeKey(key, permission);
    if (options.workspaceId && options.workspaceId !== caller.workspaceId) throw new ForbiddenError();
    return caller;
  }
  if (!SAFE_METHODS.has(request.method)) {
    const origin = request.headers.get("origin");
    if (origin !== new URL(getEnv().APP_URL).origin) {
      throw new ForbiddenError("State-changing requests with a session must come from the Peeksafe origin.");
    }
  }
  const session = await authorizeSession(request);
  if (!session) {
    await getPool().query("select 1");
    throw new UnauthorizedError();
  }
  const workspaceId = options.workspaceId ?? session.activeOrganizationId;
  if (!workspaceId) throw new ForbiddenError("Choose a workspace first.");
  const membership = await getCachedMembership(workspaceId, session.userId, () => getMembership(workspaceId, session.userId));
  if (!membership) throw new ForbiddenError();
  if (!roleAllows(membership.role, permission)) throw new ForbiddenError();
  return { kind: "user", userId: session.userId, email: session.email, workspaceId, role: membership.role };
}

function cookieValue(request: Request, name: string): string | null {
  for (const part of (request.headers.get("cookie") ?? "").split(";")) {
    const index = part.indexOf("=");
    if (index > 0 && part.slice(0, index).trim() === name) {
      try {
        return decodeURIComponent(part.slice(index + 1).trim());
      } catch {
        return null;
      }
    }
  }
  return null;
}

// Polls skip better-auth's lookup within the cache TTL; its hooks forget a session that signs out or changes.
async function authorizeSession(request: Request): Promise<CachedSession | null> {
  const auth = getAuth();
  const signed = cookieValue(request, (await auth.$context).authCookies.sessionToken.name);
  if (!signed) return null;
  return getCachedSession(signed, async () => {
    const found = await auth.api.getSession({ headers: request.headers });
    if (!found) return null;
    const { session, user } = found;
    return { token: session.token, userId: user.id, email: user.email, activeOrganizationId: session.activeOrganizationId ?? null, expiresAt: new Date(session.expiresAt).getTime() };
  });
}
