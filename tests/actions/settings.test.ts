import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, test } from "vitest";
import { getDb } from "@/db";
import { apikeys, invitations, members, organizations } from "@/db/schema";
import { createUser, createWorkspace, createWorkspaceWithRoles, uniqueEmail, type TestUser, type TestWorkspace } from "../factories";
import { TestClient } from "../helpers/http-client";
import { actionId, parseFlightResult, type ActionResult } from "../helpers/server-actions";

// Server actions are called the way the browser calls them: a POST to the page with the
// action's id in the Next-Action header and the arguments as a JSON array (React's reply encoding).
const ACTIONS = [
  "inviteMemberAction",
  "cancelInvitationAction",
  "updateMemberRoleAction",
  "removeMemberAction",
  "createApiKeyAction",
  "revokeApiKeyAction",
  "updateWorkspaceAction",
] as const;
type ActionName = (typeof ACTIONS)[number];

function loadActionIds(): Record<ActionName, string> {
  return Object.fromEntries(ACTIONS.map((name) => [name, actionId(name, "settings/actions")])) as Record<ActionName, string>;
}

let actionIds: Record<ActionName, string>;

interface ActionResponse {
  status: number;
  redirect: string | null;
  result: ActionResult | null;
}

async function callAction(client: TestClient, name: ActionName, input: unknown): Promise<ActionResponse> {
  const response = await client.fetch("/settings", {
    method: "POST",
    headers: { "next-action": actionIds[name], "content-type": "text/plain;charset=UTF-8", accept: "text/x-component" },
    body: JSON.stringify([input]),
  });
  const redirect = response.headers.get("x-action-redirect") ?? response.headers.get("location");
  const text = await response.text();
  const result = response.headers.get("content-type")?.includes("text/x-component") ? parseFlightResult(text) : null;
  return { status: response.status, redirect, result };
}

async function memberIdOf(workspaceId: string, user: TestUser): Promise<string> {
  const rows = await getDb()
    .select({ id: members.id })
    .from(members)
    .where(and(eq(members.organizationId, workspaceId), eq(members.userId, user.id)));
  return rows[0].id;
}

async function roleOf(memberId: string): Promise<string | undefined> {
  return (await getDb().select({ role: members.role }).from(members).where(eq(members.id, memberId)))[0]?.role;
}

async function invitationCount(email: string): Promise<number> {
  return (await getDb().select({ id: invitations.id }).from(invitations).where(eq(invitations.email, email))).length;
}

function expectRefused(response: ActionResponse) {
  expect(response.result, JSON.stringify(response)).toMatchObject({ ok: false, error: expect.stringMatching(/role does not allow/) });
}

let team: TestWorkspace;
let otherAdmin: TestUser;
let otherWorkspaceId: string;
let viewerMemberId: string;

beforeAll(async () => {
  actionIds = loadActionIds();
  team = await createWorkspaceWithRoles("Northwind Outfitters");
  otherAdmin = await createUser({ email: uniqueEmail("other-admin") });
  otherWorkspaceId = await createWorkspace(otherAdmin, "Northwind Rentals");
  viewerMemberId = await memberIdOf(team.id, team.viewer);
});

describe("settings actions refuse callers who are not signed in", () => {
  test.each(ACTIONS)("%s redirects to sign-in and changes nothing", async (name) => {
    const email = uniqueEmail("nobody");
    const inputs: Record<ActionName, unknown> = {
      inviteMemberAction: { email, role: "viewer" },
      cancelInvitationAction: { invitationId: "x" },
      updateMemberRoleAction: { memberId: viewerMemberId, role: "admin" },
      removeMemberAction: { memberId: viewerMemberId },
      createApiKeyAction: { name: "stolen", permissions: ["ingest"] },
      revokeApiKeyAction: { keyId: "x" },
      updateWorkspaceAction: { name: "Taken over", timeZone: "UTC" },
    };
    const response = await callAction(new TestClient(), name, inputs[name]);
    expect(response.result?.ok).not.toBe(true);
    expect(response.redirect).toMatch(/\/sign-in/);
    expect(await invitationCount(email)).toBe(0);
    expect(await roleOf(viewerMemberId)).toBe("viewer");
  });
});

describe("settings actions refuse members without the admin role", () => {
  test.each(["viewer", "marketer", "lead"] as const)("a %s can invite, change roles, remove, manage keys or rename nothing", async (role) => {
    const caller = team[role];
    const email = uniqueEmail("invitee");
    expectRefused(await callAction(caller.client, "inviteMemberAction", { email, role: "admin" }));
    expect(await invitationCount(email)).toBe(0);
    expectRefused(await callAction(caller.client, "updateMemberRoleAction", { memberId: viewerMemberId, role: "admin" }));
    expect(await roleOf(viewerMemberId)).toBe("viewer");
    expectRefused(await callAction(caller.client, "removeMemberAction", { memberId: viewerMemberId }));
    expect(await roleOf(viewerMemberId)).toBe("viewer");
    expectRefused(await callAction(caller.client, "createApiKeyAction", { name: "sneaky", permissions: ["ingest"] }));
    const keys = await getDb().select({ id: apikeys.id }).from(apikeys).where(and(eq(apikeys.referenceId, team.id), eq(apikeys.name, "sneaky")));
    expect(keys).toHaveLength(0);
    expectRefused(await callAction(caller.client, "revokeApiKeyAction", { keyId: "any" }));
    expectRefused(await callAction(caller.client, "cancelInvitationAction", { invitationId: "any" }));
    expectRefused(await callAction(caller.client, "updateWorkspaceAction", { name: "Renamed", timeZone: "UTC" }));
    const [workspace] = await getDb().select({ name: organizations.name }).from(organizations).where(eq(organizations.id, team.id));
    expect(workspace.name).toBe("Northwind Outfitters");
  });
});

describe("settings actions reject invalid input", () => {
  test("invitation with a malformed address or an unknown role", async () => {
    const bad = await callAction(team.admin.client, "inviteMemberAction", { email: "not-an-address", role: "owner" });
    expect(bad.result).toMatchObject({ ok: false });
    if (bad.result?.ok === false) {
      expect(bad.result.fieldErrors?.email?.[0]).toMatch(/valid e-mail/);
      expect(bad.result.fieldErrors?.role?.[0]).toMatch(/admin, marketer, lead or viewer/);
    }
  });

  test("role change to an unknown role, key without a name or permission, unknown time zone, missing ids", async () => {
    const role = await callAction(team.admin.client, "updateMemberRoleAction", { memberId: viewerMemberId, role: "owner" });
    expect(role.result).toMatchObject({ ok: false, fieldErrors: { role: expect.any(Array) } });
    expect(await roleOf(viewerMemberId)).toBe("viewer");
    const key = await callAction(team.admin.client, "createApiKeyAction", { name: " ", permissions: [] });
    expect(key.result).toMatchObject({ ok: false, fieldErrors: { name: expect.any(Array), permissions: expect.any(Array) } });
    const zone = await callAction(team.admin.client, "updateWorkspaceAction", { name: "Northwind Outfitters", timeZone: "Mars/Olympus" });
    expect(zone.result).toMatchObject({ ok: false, fieldErrors: { timeZone: expect.any(Array) } });
    const missing = await callAction(team.admin.client, "removeMemberAction", {});
    expect(missing.result).toMatchObject({ ok: false, fieldErrors: { memberId: expect.any(Array) } });
    const notObject = await callAction(team.admin.client, "revokeApiKeyAction", "psk_123");
    expect(notObject.result).toMatchObject({ ok: false });
  });
});

describe("settings actions stay inside the caller's workspace", () => {
  test("an admin of another workspace cannot touch this workspace's members, invitations or keys", async () => {
    const invited = uniqueEmail("pending");
    const invitation = await callAction(team.admin.client, "inviteMemberAction", { email: invited, role: "marketer" });
    expect(invitation.result).toMatchObject({ ok: true });
    const [pending] = await getDb().select({ id: invitations.id }).from(invitations).where(eq(invitations.email, invited));
    const key = await callAction(team.admin.client, "createApiKeyAction", { name: "warehouse sync", permissions: ["ingest"] });
    expect(key.result).toMatchObject({ ok: true });
    const keyId = (key.result as { data: { id: string } }).data.id;

    const role = await callAction(otherAdmin.client, "updateMemberRoleAction", { memberId: viewerMemberId, role: "admin" });
    expect(role.result).toMatchObject({ ok: false, error: "No such member in this workspace." });
    expect(await roleOf(viewerMemberId)).toBe("viewer");
    const removal = await callAction(otherAdmin.client, "removeMemberAction", { memberId: viewerMemberId });
    expect(removal.result).toMatchObject({ ok: false, error: "No such member in this workspace." });
    const cancel = await callAction(otherAdmin.client, "cancelInvitationAction", { invitationId: pending.id });
    expect(cancel.result).toMatchObject({ ok: false, error: "No such invitation in this workspace." });
    const [stillPending] = await getDb().select({ status: invitations.status }).from(invitations).where(eq(invitations.id, pending.id));
    expect(stillPending.status).toBe("pending");
    const revoke = await callAction(otherAdmin.client, "revokeApiKeyAction", { keyId });
    expect(revoke.result).toMatchObject({ ok: false, error: "No API key with this id in the workspace." });
    const [stillActive] = await getDb().select({ enabled: apikeys.enabled }).from(apikeys).where(eq(apikeys.id, keyId));
    expect(stillActive.enabled).toBe(true);
    const rename = await callAction(otherAdmin.client, "updateWorkspaceAction", { name: "Northwind Rentals two", timeZone: "Europe/Oslo" });
    expect(rename.result).toMatchObject({ ok: true });
    const names = await getDb().select({ id: organizations.id, name: organizations.name }).from(organizations).where(eq(organizations.id, team.id));
    expect(names[0].name).toBe("Northwind Outfitters");
    const [renamedOther] = await getDb().select({ name: organizations.name, timeZone: organizations.timeZone }).from(organizations).where(eq(organizations.id, otherWorkspaceId));
    expect(renamedOther).toEqual({ name: "Northwind Rentals two", timeZone: "Europe/Oslo" });
  });
});

describe("settings actions work for the admin", () => {
  test("change a role, cancel an invitation, revoke a key, and refuse to remove the last admin", async () => {
    const marketerMemberId = await memberIdOf(team.id, team.marketer);
    expect((await callAction(team.admin.client, "updateMemberRoleAction", { memberId: marketerMemberId, role: "lead" })).result).toMatchObject({ ok: true });
    expect(await roleOf(marketerMemberId)).toBe("lead");

    const email = uniqueEmail("cancelled");
    expect((await callAction(team.admin.client, "inviteMemberAction", { email, role: "viewer" })).result).toMatchObject({ ok: true });
    const duplicate = await callAction(team.admin.client, "inviteMemberAction", { email, role: "viewer" });
    expect(duplicate.result).toMatchObject({ ok: false, error: "This address has a pending invitation already." });
    const [invitation] = await getDb().select({ id: invitations.id }).from(invitations).where(eq(invitations.email, email));
    expect((await callAction(team.admin.client, "cancelInvitationAction", { invitationId: invitation.id })).result).toMatchObject({ ok: true });
    const [cancelled] = await getDb().select({ status: invitations.status }).from(invitations).where(eq(invitations.id, invitation.id));
    expect(cancelled.status).toBe("canceled");

    const key = await callAction(team.admin.client, "createApiKeyAction", { name: "nightly export", permissions: ["ingest", "read"] });
    expect(key.result).toMatchObject({ ok: true, data: { key: expect.stringMatching(/^psk_/), permissions: ["ingest", "read"] } });
    const keyId = (key.result as { data: { id: string } }).data.id;
    expect((await callAction(team.admin.client, "revokeApiKeyAction", { keyId })).result).toMatchObject({ ok: true });
    const [revoked] = await getDb().select({ enabled: apikeys.enabled }).from(apikeys).where(eq(apikeys.id, keyId));
    expect(revoked.enabled).toBe(false);

    const adminMemberId = await memberIdOf(team.id, team.admin);
    const leave = await callAction(team.admin.client, "removeMemberAction", { memberId: adminMemberId });
    expect(leave.result).toMatchObject({ ok: false, error: expect.stringMatching(/last admin/) });
    const demote = await callAction(team.admin.client, "updateMemberRoleAction", { memberId: adminMemberId, role: "viewer" });
    expect(demote.result).toMatchObject({ ok: false, error: expect.stringMatching(/at least one admin/) });
    expect(await roleOf(adminMemberId)).toBe("admin");

    const leadRemoved = await callAction(team.admin.client, "removeMemberAction", { memberId: await memberIdOf(team.id, team.lead) });
    expect(leadRemoved.result).toMatchObject({ ok: true });
  });
});
