import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { apikeys } from "@/db/schema";

/** What the product shows of a key: never the hash. */
export interface ApiKeySummary {
  id: string;
  name: string | null;
  start: string | null;
  permissions: Record<string, string[]>;
  enabled: boolean;
  createdAt: Date;
  lastRequest: Date | null;
}

/** The permissions column of a key (JSON text); a malformed or empty one grants nothing. */
export function parsePermissions(value: string | null): Record<string, string[]> {
  if (!value) return {};
  try {
    const parsed: unknown = JSON.parse(value);
    return parsed && typeof parsed === "object" ? (parsed as Record<string, string[]>) : {};
  } catch {
    return {};
  }
}

const summaryColumns = {
  id: apikeys.id,
  name: apikeys.name,
  start: apikeys.start,
  permissions: apikeys.permissions,
  enabled: apikeys.enabled,
  createdAt: apikeys.createdAt,
  lastRequest: apikeys.lastRequest,
};

/** The workspace's keys, newest first, revoked ones included (enabled = false). */
export async function listApiKeys(workspaceId: string): Promise<ApiKeySummary[]> {
  const rows = await getDb()
    .select(summaryColumns)
    .from(apikeys)
    .where(eq(apikeys.referenceId, workspaceId))
    .orderBy(desc(apikeys.createdAt));
  return rows.map((row) => ({ ...row, enabled: row.enabled ?? true, permissions: parsePermissions(row.permissions) }));
}

/** Revokes a key of the workspace; returns false when no such key belongs to it. */
export async function revokeApiKey(workspaceId: string, keyId: string): Promise<boolean> {
  const rows = await getDb()
    .update(apikeys)
    .set({ enabled: false, updatedAt: new Date() })
    .where(and(eq(apikeys.id, keyId), eq(apikeys.referenceId, workspaceId)))
    .returning({ id: apikeys.id });
  return rows.length > 0;
}
