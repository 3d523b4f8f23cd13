import { and, desc, eq } from "drizzle-orm";
import { getDb } from "@/db";
import { apikeys, ingestBatches } from "@/db/schema";
import type { Executor } from "./campaigns";

export interface StoredBatch {
  id: string;
  requestHash: string;
  responseStatus: number;
  responseBody: unknown;
}

/** The batch recorded under an idempotency key in the workspace, or null. */
export async function getIngestBatch(executor: Executor, workspaceId: string, idempotencyKey: string): Promise<StoredBatch | null> {
  const [row] = await executor
    .select({ id: ingestBatches.id, requestHash: ingestBatches.requestHash, responseStatus: ingestBatches.responseStatus, responseBody: ingestBatches.responseBody })
    .from(ingestBatches)
    .where(and(eq(ingestBatches.workspaceId, workspaceId), eq(ingestBatches.idempotencyKey, idempotencyKey)))
    .limit(1);
  return row ?? null;
}

/** The workspace's latest batches, newest first. */
export async function listIngestBatches(workspaceId: string, limit = 50) {
  return getDb()
    .select({
      id: ingestBatches.id,
      source: ingestBatches.source,
      apiKeyId: ingestBatches.apiKeyId,
      userId: ingestBatches.userId,
      receivedAt: ingestBatches.receivedAt,
      rowCount: ingestBatches.rowCount,
      accepted: ingestBatches.accepted,
      replaced: ingestBatches.replaced,
      unchanged: ingestBatches.unchanged,
      outcome: ingestBatches.outcome,
    })
    .from(ingestBatches)
    .where(eq(ingestBatches.workspaceId, workspaceId))
    .orderBy(desc(ingestBatches.receivedAt))
    .limit(limit);
}

/** A pipeline key's request count in its current rate-limit window (for the RateLimit headers). */
export async function getKeyUsage(keyId: string) {
  const [row] = await getDb()
    .select({ requestCount: apikeys.requestCount, lastRequest: apikeys.lastRequest, max: apikeys.rateLimitMax, windowMs: apikeys.rateLimitTimeWindow })
    .from(apikeys)
    .where(eq(apikeys.id, keyId))
    .limit(1);
  return row ?? null;
}
