import type { Logger } from "pino";
import { getAlertRule, listDigestWorkspaces } from "@/db/queries/alert-rules";
import { claimDigest, listAlertRecipients, markDigest } from "@/db/queries/alerts";
import { listRunningCampaignCalls } from "@/db/queries/analysis";
import { createLogger } from "@/lib/logger";
import { renderDigestMail } from "@/lib/mail/alert-mail";
import { sendMail } from "@/lib/mail/transport";
import { getEnv } from "@/lib/env";
import { getWorkerEnv } from "./config";
import { withJobLock } from "./lock";
import { campaignUrl } from "./mailer";

export interface DigestSummary {
  ran: boolean;
  workspaces: number;
  sent: number;
  failed: number;
}

/** The calendar day (`YYYY-MM-DD`) at `now` in a time zone. */
export function localDay(now: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-CA", { timeZone, year: "numeric", month: "2-digit", day: "2-digit" }).format(now);
}

/**
 * The daily digest: for each workspace that turned it on (of `workspaceIds` when given), one e-mail
 * per person who follows any of its running campaigns, listing every running campaign's call. Sent
 * at most once per person, workspace and local day; a failed send is retried by the next run.
 */
export async function runDigest(
  options: { workspaceIds?: string[]; now?: Date; wait?: boolean; logger?: Logger } = {},
): Promise<DigestSummary> {
  const logger = options.logger ?? createLogger("digest");
  const wait = options.wait ?? getWorkerEnv().WORKER_WAIT_FOR_LOCK === "true";
  const now = options.now ?? new Date();
  const locked = await withJobLock("digest", logger, { wait }, async () => {
    let workspaces = 0;
    let sent = 0;
    let failed = 0;
    for (const workspace of await listDigestWorkspaces()) {
      if (options.workspaceIds && !options.workspaceIds.includes(workspace.id)) continue;
      const campaigns = await listRunningCampaignCalls(workspace.id);
      if (campaigns.length === 0) continue;
      workspaces += 1;
      const rule = await getAlertRule(workspace.id);
      const people = new Map<string, string>();
      for (const campaign of campaigns) {
        const recipients = await listAlertRecipients({ campaignId: campaign.id, workspaceId: workspace.id, createdBy: campaign.createdBy }, { ...rule, extraRecipients: [] });
        for (const recipient of recipients) if (recipient.userId) people.set(recipient.userId, recipient.email);
      }
      const day = localDay(now, workspace.timeZone);
      const content = renderDigestMail({
        workspaceName: workspace.name,
        day,
        campaigns: campaigns.map((campaign) => ({
          name: campaign.name,
          url: campaignUrl(campaign.id),
          call: campaign.currentCall,
          daysRun: campaign.daysRun,
          liftRelative: campaign.liftRelative,
          sequentialP: campaign.sequentialP,
          fixedP: campaign.fixedP,
        })),
      });
      for (const [userId, email] of people) {
        const id = await claimDigest(workspace.id, userId, day);
        if (!id) continue;
        try {
          await sendMail({ to: email, ...content, messageId: `<digest-${id}@${new URL(getEnv().APP_URL).hostname}>` });
          await markDigest(id, { sent: true });
          sent += 1;
        } catch (error) {
          failed += 1;
          const message = error instanceof Error ? error.message : String(error);
          await markDigest(id, { sent: false, error: message });
          logger.warn({ workspaceId: workspace.id, userId, error: message }, "digest not sent; the next run retries");
        }
      }
    }
    logger.info({ workspaces, sent, failed }, "digest pass done");
    return { workspaces, sent, failed };
  });
  return locked.ran ? { ran: true, ...locked.result } : { ran: false, workspaces: 0, sent: 0, failed: 0 };
}
