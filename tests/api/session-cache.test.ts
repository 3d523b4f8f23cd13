import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db";
import { members } from "@/db/schema";
import { TestClient } from "../helpers/http-client";
import { addMember, createUser, createWorkspace, createWorkspaceWithRoles, setActiveWorkspace, type TestUser, type TestWorkspace } from "../factories";

// Route handlers keep a verified session and a membership for a few seconds (lib/auth/session-cache.ts).
// Each test reads first, so the cache holds the entry, then changes it and expects the change at once.

let northwind: TestWorkspace;

beforeAll(async () => {
  northwind = await createWorkspaceWithRoles("Northwind Outfitters");
});

async function memberId(workspaceId: string, user: TestUser): Promise<string> {
  const [row] = await getDb()
    .select({ id: members.id })
    .from(members)
    .where(and(eq(members.organizationId, workspaceId), eq(members.userId, user.id)));
  return row.id;
}

const whoami = (user: TestUser) => user.client.json<{ workspaceId: string; role: string }>("/api/v1/whoami");

describe("the session and membership cache of route handlers", () => {
  it("refuses a removed member at once, though their membership was just read", async () => {
    const leaving = await createUser();
    await addMember(northwind.id, leaving, "viewer");
    expect((await whoami(leaving)).status).toBe(200);
    const removed = await northwind.admin.client.fetch("/api/auth/organization/remove-member", {
      method: "POST",
      json: { memberIdOrEmail: await memberId(northwind.id, leaving), organizationId: northwind.id },
    });
    expect(removed.status).toBe(200);
    expect((await whoami(leaving)).status).toBe(403);
    expect((await leaving.client.fetch("/api/v1/campaigns")).status).toBe(403);
  });

  it("applies a role change at once, up and down", async () => {
    const changing = await createUser();
    await addMember(northwind.id, changing, "viewer");
    expect((await changing.client.fetch("/api/v1/keys")).status).toBe(403);
    const id = await memberId(northwind.id, changing);
    const promote = await northwind.admin.client.fetch("/api/auth/organization/update-member-role", {
      method: "POST",
      json: { memberId: id, role: "admin", organizationId: northwind.id },
    });
    expect(promote.status).toBe(200);
    expect((await changing.client.fetch("/api/v1/keys")).status).toBe(200);
    const demote = await northwind.admin.client.fetch("/api/auth/organization/update-member-role", {
      method: "POST",
      json: { memberId: id, role: "viewer", organizationId: northwind.id },
    });
    expect(demote.status).toBe(200);
    expect((await changing.client.fetch("/api/v1/keys")).status).toBe(403);
    expect((await whoami(changing)).body.role).toBe("viewer");
  });

  it("refuses a signed-out session's cookie at once when it is sent again", async () => {
    const leaving = await createUser();
    await addMember(northwind.id, leaving, "viewer");
    const kept = new TestClient();
    for (const [name, value] of leaving.client.cookies) kept.cookies.set(name, value);
    expect((await kept.fetch("/api/v1/whoami")).status).toBe(200);
    expect((await leaving.client.fetch("/api/auth/sign-out", { method: "POST", json: {} })).status).toBe(200);
    expect((await kept.fetch("/api/v1/whoami")).status).toBe(401);
  });

  it("follows a switch of the active workspace at once", async () => {
    const southridge = await createWorkspace(northwind.admin, "Southridge Cycles");
    expect((await whoami(northwind.admin)).body.workspaceId).toBe(southridge);
    await setActiveWorkspace(northwind.admin, northwind.id);
    expect((await whoami(northwind.admin)).body.workspaceId).toBe(northwind.id);
  });

  it("refuses a member who left the workspace at once", async () => {
    const leaving = await createUser();
    await addMember(northwind.id, leaving, "marketer");
    const kept = new TestClient();
    for (const [name, value] of leaving.client.cookies) kept.cookies.set(name, value);
    expect((await kept.fetch("/api/v1/campaigns")).status).toBe(200);
    expect((await leaving.client.fetch("/api/auth/organization/leave", { method: "POST", json: { organizationId: northwind.id } })).status).toBe(200);
    expect((await kept.fetch("/api/v1/campaigns")).status).toBe(403);
  });
});
