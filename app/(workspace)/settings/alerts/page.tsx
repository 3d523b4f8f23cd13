import type { Metadata } from "next";
import Link from "next/link";
import { Card, CardHeader } from "@/components/ui/card";
import { Notice } from "@/components/ui/notice";
import { getAlertRule } from "@/db/queries/alert-rules";
import { CALLS } from "@/db/schema/campaigns";
import { CALL_WORDS } from "@/lib/alerts/call-words";
import { roleAllows, ROLE_NAMES, type RoleName } from "@/lib/auth/permissions";
import { requireWorkspace } from "@/lib/auth/session";
import { AlertRulesForm, type Choice } from "./_components/alert-rules-form";

export const metadata: Metadata = { title: "Alert rules" };

const ROLE_WORDS: Record<RoleName, { label: string; description: string }> = {
  admin: { label: "Admins", description: "Manage members, keys and settings." },
  lead: { label: "Leads", description: "Record decisions and trigger recomputes." },
  marketer: { label: "Marketers", description: "Plan campaigns and upload counts." },
  viewer: { label: "Viewers", description: "Read campaigns only." },
};

const CALL_CHOICES: Choice[] = CALLS.map((call) => ({ value: call, label: CALL_WORDS[call].phrase, description: CALL_WORDS[call].action }));
const ROLE_CHOICES: Choice[] = ROLE_NAMES.map((role) => ({ value: role, ...ROLE_WORDS[role] }));

function listOrNone(items: string[], none: string): string {
  return items.length > 0 ? items.join(", ") : none;
}

export default async function AlertRulesPage() {
  const { membership } = await requireWorkspace();
  const rule = await getAlertRule(membership.workspaceId);
  const canEdit = roleAllows(membership.role, { alertRule: ["update"] });

  return (
    <div className="space-y-6">
      <div>
        <p className="text-sm">
          <Link href="/settings" className="text-pine-800 underline dark:text-pine-200">
            Settings
          </Link>
          <span aria-hidden="true"> / </span>
          Alert rules
        </p>
        <h1 className="mt-1 text-2xl font-semibold tracking-tight">Alert rules</h1>
        <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">
          Which stop-or-continue calls of {membership.workspaceName} are e-mailed, and to whom.
        </p>
      </div>

      <Card aria-labelledby="alert-rules-heading">
        <CardHeader id="alert-rules-heading" title="E-mail alerts and the daily digest" description="One e-mail each time a campaign's call changes; numbers in the e-mail are frozen at that day." />
        {canEdit ? (
          <AlertRulesForm
            initial={{ calls: rule.calls, defaultRecipientRoles: rule.defaultRecipientRoles.filter((role): role is RoleName => (ROLE_NAMES as readonly string[]).includes(role)), extraRecipients: rule.extraRecipients.join("\n"), dailyDigest: rule.dailyDigest }}
            calls={CALL_CHOICES}
            roles={ROLE_CHOICES}
          />
        ) : (
          <div className="space-y-4">
            <Notice tone="info" title="Read only">
              Only admins and leads of {membership.workspaceName} change the alert rules. You can still subscribe to or unsubscribe from each campaign on its page.
            </Notice>
            <dl className="grid gap-4 text-sm sm:grid-cols-2" aria-label="Alert rules">
              <div>
                <dt className="text-tremor-content dark:text-dark-tremor-content">Calls that send an alert</dt>
                <dd className="font-medium">{listOrNone(CALLS.filter((call) => rule.calls.includes(call)).map((call) => CALL_WORDS[call].phrase), "None: no alert e-mails")}</dd>
              </div>
              <div>
                <dt className="text-tremor-content dark:text-dark-tremor-content">Roles that receive every campaign&apos;s alerts</dt>
                <dd className="font-medium">{listOrNone(ROLE_CHOICES.filter((role) => rule.defaultRecipientRoles.includes(role.value)).map((role) => role.label), "None besides creators and subscribers")}</dd>
              </div>
              <div>
                <dt className="text-tremor-content dark:text-dark-tremor-content">Extra addresses</dt>
                <dd className="break-all font-medium">{listOrNone(rule.extraRecipients, "None")}</dd>
              </div>
              <div>
                <dt className="text-tremor-content dark:text-dark-tremor-content">Daily digest</dt>
                <dd className="font-medium">{rule.dailyDigest ? "On" : "Off"}</dd>
              </div>
            </dl>
          </div>
        )}
      </Card>
    </div>
  );
}
