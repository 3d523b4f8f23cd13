import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { alertRules, CALLS, organizations, type CallName } from "@/db/schema";

export interface AlertRuleSettings {
  workspaceId: string;
  calls: CallName[];
  defaultRecipientRoles: string[];
  extraRecipients: string[];
  dailyDigest: boolean;
}

/** The defaults before a workspace changes anything: every call alerts, admins and leads receive them, no digest. */
export const DEFAULT_ALERT_RULE: Omit<AlertRuleSettings, "workspaceId"> = {
  calls: [...CALLS],
  defaultRecipientRoles: ["admin", "lead"],
  extraRecipients: [],
  dailyDigest: false,
};

/** The workspace's alert rules (the defaults when none were saved). */
export async function getAlertRule(workspaceId: string): Promise<AlertRuleSettings> {
  const rows = await getDb()
    .select({
      calls: alertRules.calls,
      defaultRecipientRoles: alertRules.defaultRecipientRoles,
      extraRecipients: alertRules.extraRecipients,
      dailyDigest: alertRules.dailyDigest,
    })
    .from(alertRules)
    .where(eq(alertRules.workspaceId, workspaceId))
    .limit(1);
  const row = rows[0];
  if (!row) return { workspaceId, ...DEFAULT_ALERT_RULE };
  return { workspaceId, ...row, calls: row.calls.filter((call): call is CallName => (CALLS as readonly string[]).includes(call)) };
}

/** Saves the workspace's alert rules (validated by the caller). */
export async function updateAlertRule(settings: AlertRuleSettings): Promise<AlertRuleSettings> {
  const values = {
    calls: settings.calls,
    defaultRecipientRoles: settings.defaultRecipientRoles,
    extraRecipients: settings.extraRecipients,
    dailyDigest: settings.dailyDigest,
  };
  await getDb()
    .insert(alertRules)
    .values({ workspaceId: settings.workspaceId, ...values })
    .onConflictDoUpdate({ target: alertRules.workspaceId, set: { ...values, updatedAt: new Date() } });
  return getAlertRule(settings.workspaceId);
}

/** Workspaces that asked for the daily digest, with their name and time zone (UTC when unset). */
export async function listDigestWorkspaces(): Promise<{ id: string; name: string; timeZone: string }[]> {
  const rows = await getDb()
    .select({ id: organizations.id, name: organizations.name, timeZone: organizations.timeZone })
    .from(alertRules)
    .innerJoin(organizations, eq(organizations.id, alertRules.workspaceId))
    .where(eq(alertRules.dailyDigest, true));
  return rows.map((row) => ({ ...row, timeZone: row.timeZone || "UTC" }));
}
