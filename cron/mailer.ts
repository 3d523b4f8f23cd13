import type { Logger } from "pino";
import { getAlertRule } from "@/db/queries/alert-rules";
import {
  closeAlertWithoutMail,
  ensureDeliveries,
  listAlertRecipients,
  listDueDeliveries,
  listUnsentAlerts,
  markDeliveryFailed,
  markDeliverySent,
  settleAlert,
  type DueDelivery,
} from "@/db/queries/alerts";
import { getEnv } from "@/lib/env";
import { createLogger } from "@/lib/logger";
import { renderAlertMail } from "@/lib/mail/alert-mail";
import { sendMail } from "@/lib/mail/transport";
import { createUnsubscribeToken } from "@/lib/unsubscribe-token";
import { getWorkerEnv } from "./config";
import { withJobLock } from "./lock";

export interface MailerSummary {
  ran: boolean;
  sent: number;
  failed: number;
  /** Alerts no one was to receive (call not alerted by the rules, or no recipient). */
  closedWithoutMail: number;
}

/** Backoff before the next attempt after `attempts` failures: 30 s doubling, at most one hour. */
export function retryDelayMs(attempts: number): number {
  return Math.min(60 * 60 * 1000, 30_000 * 2 ** Math.max(0, attempts - 1));
}

/** The stable Message-ID of one alert to one recipient: a resend after a crash is the same message. */
export function alertMessageId(deliveryId: string, appUrl = getEnv().APP_URL): string {
  return `<alert-${deliveryId}@${new URL(appUrl).hostname}>`;
}

/** Campaign page address (the campaign page lives at /campaigns/:id). */
export function campaignUrl(campaignId: string, appUrl = getEnv().APP_URL): string {
  return new URL(`/campaigns/${campaignId}`, appUrl).toString();
}

export function unsubscribeUrl(campaignId: string, userId: string, appUrl = getEnv().APP_URL): string {
  const url = new URL("/unsubscribe", appUrl);
  url.searchParams.set("token", createUnsubscribeToken({ campaignId, userId }));
  return url.toString();
}

/**
 * Drains the alert outbox: expands each unsent alert into one delivery per recipient (subscribers,
 * default recipients, extra addresses), sends every due delivery over SMTP with its stable
 * Message-ID, records attempts and the last error, and retries failures with backoff. Safe to run
 * twice; under the job's advisory lock. `now` decides which retries are due.
 */
export async function runMailer(
  options: { now?: Date; wait?: boolean; logger?: Logger; workspaceIds?: string[] } = {},
): Promise<MailerSummary> {
  const logger = options.logger ?? createLogger("mailer");
  const wait = options.wait ?? getWorkerEnv().WORKER_WAIT_FOR_LOCK === "true";
  const locked = await withJobLock("mailer", logger, { wait }, () => drainOutbox(options.now ?? null, logger, options.workspaceIds));
  return locked.ran ? locked.result : { ran: false, sent: 0, failed: 0, closedWithoutMail: 0 };
}

async function drainOutbox(at: Date | null, logger: Logger, workspaceIds?: string[]): Promise<MailerSummary> {
  let closedWithoutMail = 0;
  const touched = new Set<string>();
  for (const alert of await listUnsentAlerts(200, workspaceIds)) {
    const rule = await getAlertRule(alert.workspaceId);
    if (!rule.calls.includes(alert.kind)) {
      await closeAlertWithoutMail(alert.id, `the workspace's alert rules do not mail "${alert.kind}"`);
      closedWithoutMail += 1;
      continue;
    }
    const recipients = await listAlertRecipients(alert, rule);
    await ensureDeliveries(alert.id, recipients);
    touched.add(alert.id);
  }
  let sent = 0;
  let failed = 0;
  // Read the clock after expanding, so the deliveries just created are due (same clock as their nextAttemptAt).
  const now = at ?? new Date();
  for (const delivery of await listDueDeliveries(now, 500, workspaceIds)) {
    touched.add(delivery.alertId);
    try {
      await deliver(delivery);
      await markDeliverySent(delivery.id);
      sent += 1;
      logger.info({ alertId: delivery.alertId, deliveryId: delivery.id, campaignId: delivery.campaignId, call: delivery.kind }, "alert sent");
    } catch (error) {
      failed += 1;
      const message = error instanceof Error ? error.message : String(error);
      const next = new Date(now.getTime() + retryDelayMs(delivery.attempts + 1));
      await markDeliveryFailed(delivery.id, message, next);
      logger.warn({ alertId: delivery.alertId, deliveryId: delivery.id, attempts: delivery.attempts + 1, nextAttemptAt: next, error: message }, "alert not sent; will retry");
    }
  }
  for (const alertId of touched) {
    const closed = await settleAlert(alertId);
    if (closed) logger.debug({ alertId }, "alert delivered to every recipient");
  }
  if (sent + failed + closedWithoutMail > 0) logger.info({ sent, failed, closedWithoutMail }, "mailer pass done");
  return { ran: true, sent, failed, closedWithoutMail };
}

async function deliver(delivery: DueDelivery): Promise<void> {
  const unsubscribe = delivery.userId ? unsubscribeUrl(delivery.campaignId, delivery.userId) : null;
  const content = renderAlertMail(delivery.snapshot, { campaignUrl: campaignUrl(delivery.campaignId), unsubscribeUrl: unsubscribe });
  const headers: Record<string, string> = {
    "X-Peeksafe-Alert": delivery.alertId,
    "X-Peeksafe-Call": delivery.kind,
  };
  if (unsubscribe) {
    const oneClick = new URL(unsubscribe);
    oneClick.pathname = "/unsubscribe/confirm";
    headers["List-Unsubscribe"] = `<${oneClick.toString()}>`;
    headers["List-Unsubscribe-Post"] = "List-Unsubscribe=One-Click";
  }
  await sendMail({ to: delivery.email, ...content, messageId: alertMessageId(delivery.id), headers });
}
