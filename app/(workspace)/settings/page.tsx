import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { Card, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { Notice } from "@/components/ui/notice";
import { Table, Td, Th } from "@/components/ui/table";
import { listMembers } from "@/db/queries/members";
import { listWorkspaceApiKeys } from "@/lib/api-keys";
import { roleAllows } from "@/lib/auth/permissions";
import { requireWorkspace } from "@/lib/auth/session";
import { listPendingInvitations } from "@/lib/members";
import { listTimeZones } from "@/lib/validation/workspace";
import { CancelInvitationButton } from "./_components/cancel-invitation-button";
import { CreateApiKeyForm } from "./_components/create-api-key-form";
import { InviteMemberForm } from "./_components/invite-member-form";
import { MemberControls } from "./_components/member-controls";
import { RevokeApiKeyButton } from "./_components/revoke-api-key-button";
import { WorkspaceForm } from "./_components/workspace-form";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const { session, membership } = await requireWorkspace();
  const canManageMembers = roleAllows(membership.role, { member: ["create", "update", "delete"], invitation: ["create", "cancel"] });
  const canManageKeys = roleAllows(membership.role, { apiKey: ["create", "read", "delete"] });
  const canEditWorkspace = roleAllows(membership.role, { organization: ["update"] });

  const dates = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeZone: membership.timeZone });
  const dateTimes = new Intl.DateTimeFormat("en-GB", { dateStyle: "medium", timeStyle: "short", timeZone: membership.timeZone });
  const members = await listMembers(membership.workspaceId);
  const invitations = canManageMembers ? await listPendingInvitations(membership.workspaceId, await headers()) : [];
  const keys = canManageKeys ? await listWorkspaceApiKeys(membership.workspaceId) : [];

  return (
    <div className="space-y-6">
      <div>
        <h1 className="text-2xl font-semibold tracking-tight">Settings</h1>
        <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">
          {membership.workspaceName} · your role: <strong>{membership.role}</strong> ·{" "}
          <Link href="/settings/alerts" className="text-pine-800 underline dark:text-pine-200">
            Alert rules
          </Link>
        </p>
      </div>

      <Card aria-labelledby="workspace-heading">
        <CardHeader id="workspace-heading" title="Workspace" description="Its name, and the time zone its days of counts follow." />
        {canEditWorkspace ? (
          <WorkspaceForm initial={{ name: membership.workspaceName, timeZone: membership.timeZone }} timeZones={listTimeZones()} />
        ) : (
          <dl className="grid gap-3 text-sm sm:grid-cols-2">
            <div>
              <dt className="text-tremor-content dark:text-dark-tremor-content">Name</dt>
              <dd className="font-medium">{membership.workspaceName}</dd>
            </div>
            <div>
              <dt className="text-tremor-content dark:text-dark-tremor-content">Time zone</dt>
              <dd className="font-medium">{membership.timeZone}</dd>
            </div>
          </dl>
        )}
      </Card>

      <Card aria-labelledby="members-heading">
        <CardHeader
          id="members-heading"
          title="Members"
          description={canManageMembers ? "Invite colleagues and choose what each may do." : "Only admins can invite members or change roles."}
        />
        {canManageMembers ? (
          <div className="mb-6">
            <InviteMemberForm />
          </div>
        ) : (
          <Notice tone="info" title={`You are a ${membership.role}`} className="mb-4">
            Ask an admin of {membership.workspaceName} if you need another role.
          </Notice>
        )}
        <Table caption={`Members of ${membership.workspaceName}`}>
          <thead>
            <tr>
              <Th>Name</Th>
              <Th>E-mail</Th>
              <Th>Role</Th>
              <Th numeric>Joined</Th>
              {canManageMembers ? (
                <Th numeric>
                  <span className="sr-only">Actions</span>
                </Th>
              ) : null}
            </tr>
          </thead>
          <tbody>
            {members.map((member) => {
              const isSelf = member.userId === session.user.id;
              return (
                <tr key={member.memberId}>
                  <Td className="font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">
                    {member.name || "—"}
                    {isSelf ? <span className="ml-2 text-xs font-normal text-tremor-content dark:text-dark-tremor-content">(you)</span> : null}
                  </Td>
                  <Td className="break-all">{member.email}</Td>
                  <Td>
                    <Badge tone={member.role === "admin" ? "brand" : "neutral"}>{member.role}</Badge>
                  </Td>
                  <Td numeric>{dates.format(member.joinedAt)}</Td>
                  {canManageMembers ? (
                    <Td numeric>
                      <MemberControls memberId={member.memberId} name={member.name || member.email} role={member.role} isSelf={isSelf} />
                    </Td>
                  ) : null}
                </tr>
              );
            })}
          </tbody>
        </Table>

        {canManageMembers ? (
          <div className="mt-6">
            <h3 className="mb-2 text-sm font-semibold">Pending invitations</h3>
            {invitations.length === 0 ? (
              <p className="text-sm text-tremor-content dark:text-dark-tremor-content">No invitation is waiting for an answer.</p>
            ) : (
              <Table caption="Pending invitations">
                <thead>
                  <tr>
                    <Th>E-mail</Th>
                    <Th>Role</Th>
                    <Th numeric>Expires</Th>
                    <Th numeric>
                      <span className="sr-only">Actions</span>
                    </Th>
                  </tr>
                </thead>
                <tbody>
                  {invitations.map((invitation) => (
                    <tr key={invitation.id}>
                      <Td className="break-all">{invitation.email}</Td>
                      <Td>
                        <Badge>{invitation.role}</Badge>
                      </Td>
                      <Td numeric>{dateTimes.format(invitation.expiresAt)}</Td>
                      <Td numeric>
                        <CancelInvitationButton invitationId={invitation.id} email={invitation.email} />
                      </Td>
                    </tr>
                  ))}
                </tbody>
              </Table>
            )}
          </div>
        ) : null}
      </Card>

      <Card aria-labelledby="keys-heading">
        <CardHeader id="keys-heading" title="API keys" description="Keys let your data pipeline push daily counts to this workspace." />
        {canManageKeys ? (
          <div className="space-y-6">
            <CreateApiKeyForm />
            {keys.length === 0 ? (
              <EmptyState title="No API keys yet" description="Create one for the job that exports your daily counts." />
            ) : (
              <Table caption="API keys">
                <thead>
                  <tr>
                    <Th>Name</Th>
                    <Th>Starts with</Th>
                    <Th>Permissions</Th>
                    <Th>Status</Th>
                    <Th numeric>Created</Th>
                    <Th numeric>Last used</Th>
                    <Th numeric>
                      <span className="sr-only">Actions</span>
                    </Th>
                  </tr>
                </thead>
                <tbody>
                  {keys.map((key) => (
                    <tr key={key.id}>
                      <Td className="font-medium text-tremor-content-strong dark:text-dark-tremor-content-strong">{key.name ?? "—"}</Td>
                      <Td>
                        <code className="font-mono text-xs">{key.start ? `${key.start}…` : "—"}</code>
                      </Td>
                      <Td>{key.permissions.join(", ") || "none"}</Td>
                      <Td>
                        <Badge tone={key.status === "active" ? "success" : "neutral"}>{key.status}</Badge>
                      </Td>
                      <Td numeric>{dates.format(key.createdAt)}</Td>
                      <Td numeric>{key.lastRequest ? dateTimes.format(key.lastRequest) : "never"}</Td>
                      <Td numeric>{key.status === "active" ? <RevokeApiKeyButton keyId={key.id} name={key.name ?? "this key"} /> : null}</Td>
                    </tr>
                  ))}
                </tbody>
              </Table>
            )}
          </div>
        ) : (
          <Notice tone="info" title="Admins only">
            Only admins of {membership.workspaceName} create and revoke API keys.
          </Notice>
        )}
      </Card>
    </div>
  );
}
