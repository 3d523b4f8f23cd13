import { desc, eq } from "drizzle-orm";
import { getDb, type Database } from "@/db";
import { auditEvents } from "@/db/schema";

export interface NewAuditEvent {
  workspaceId: string;
  actorUserId?: string | null;
  actorApiKeyId?: string | null;
  action: string;
  targetType: string;
  targetId: string;
  reason?: string | null;
  detail?: Record<string, unknown>;
}

type Executor = Pick<Database, "insert">;

/** Appends one audit event; pass `tx` to write it in the caller's transaction. */
export async function createAuditEvent(event: NewAuditEvent, executor: Executor = getDb()): Promise<void> {
  await executor.insert(auditEvents).values({ ...event, detail: event.detail ?? {} });
}

/** The workspace's latest audit events, newest first. */
export async function listAuditEvents(workspaceId: string, limit = 100) {
  return getDb()
    .select({
      id: auditEvents.id,
      action: auditEvents.action,
      targetType: auditEvents.targetType,
      targetId: auditEvents.targetId,
      reason: auditEvents.reason,
      detail: auditEvents.detail,
      actorUserId: auditEvents.actorUserId,
      actorApiKeyId: auditEvents.actorApiKeyId,
      createdAt: auditEvents.createdAt,
    })
    .from(auditEvents)
    .where(eq(auditEvents.workspaceId, workspaceId))
    .orderBy(desc(auditEvents.createdAt))
    .limit(limit);
}
