import { randomUUID } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "@/db";
import { members, users } from "@/db/schema";
import type { RoleName } from "@/lib/auth/permissions";
import { TestClient } from "./helpers/http-client";

export const TEST_PASSWORD = "correct-horse-battery";

export interface TestUser {
  id: string;
  email: string;
  name: string;
  password: string;
  client: TestClient;
}

let counter = 0;
/** A unique e-mail address for this test run. */
export function uniqueEmail(prefix = "member"): string {
  counter += 1;
  return `${prefix}.${Date.now().toString(36)}${counter}${randomUUID().slice(0, 4)}@northwind-test.example`;
}

/** Signs a user up through the API, marks the address verified in the database, and signs in. */
export async function createUser(options: { email?: string; name?: string } = {}): Promise<TestUser> {
  const email = options.email ?? uniqueEmail();
  const name = options.name ?? email.split("@")[0];
  const client = new TestClient();
  const signUp = await client.json<{ user: { id: string } }>("/api/auth/sign-up/email", {
    method: "POST",
    json: { email, password: TEST_PASSWORD, name },
  });
  if (signUp.status !== 200) throw new Error(`sign-up failed: ${signUp.status} ${JSON.stringify(signUp.body)}`);
  await getDb().update(users).set({ emailVerified: true }).where(eq(users.email, email));
  await signIn(client, email);
  return { id: signUp.body.user.id, email, name, password: TEST_PASSWORD, client };
}

export async function signIn(client: TestClient, email: string, password = TEST_PASSWORD): Promise<void> {
  const response = await client.json("/api/auth/sign-in/email", { method: "POST", json: { email, password } });
  if (response.status !== 200) throw new Error(`sign-in failed: ${response.status} ${JSON.stringify(response.body)}`);
}

/** Creates a workspace through the auth API (its creator becomes admin) and makes it active. */
export async function createWorkspace(owner: TestUser, name = "Northwind Outfitters"): Promise<string> {
  const slug = `${name.toLowerCase().replace(/[^a-z0-9]+/g, "-")}-${randomUUID().slice(0, 8)}`;
  const created = await owner.client.json<{ id: string }>("/api/auth/organization/create", {
    method: "POST",
    json: { name, slug },
  });
  if (created.status !== 200) throw new Error(`workspace creation failed: ${created.status} ${JSON.stringify(created.body)}`);
  await setActiveWorkspace(owner, created.body.id);
  return created.body.id;
}

export async function setActiveWorkspace(user: TestUser, workspaceId: string): Promise<void> {
  const response = await user.client.json("/api/auth/organization/set-active", {
    method: "POST",
    json: { organizationId: workspaceId },
  });
  if (response.status !== 200) throw new Error(`set-active failed: ${response.status} ${JSON.stringify(response.body)}`);
}

/** Adds a user to a workspace with a role, straight in the database, and makes it their active workspace. */
export async function addMember(workspaceId: string, user: TestUser, role: RoleName): Promise<void> {
  await getDb().insert(members).values({ id: randomUUID(), organizationId: workspaceId, userId: user.id, role, createdAt: new Date() });
  await setActiveWorkspace(user, workspaceId);
}

export interface TestWorkspace {
  id: string;
  admin: TestUser;
  marketer: TestUser;
  lead: TestUser;
  viewer: TestUser;
}

/** A workspace with one signed-in user per role. */
export async function createWorkspaceWithRoles(name?: string): Promise<TestWorkspace> {
  const admin = await createUser({ email: uniqueEmail("admin") });
  const id = await createWorkspace(admin, name);
  const [marketer, lead, viewer] = await Promise.all([
    createUser({ email: uniqueEmail("marketer") }),
    createUser({ email: uniqueEmail("lead") }),
    createUser({ email: uniqueEmail("viewer") }),
  ]);
  await addMember(id, marketer, "marketer");
  await addMember(id, lead, "lead");
  await addMember(id, viewer, "viewer");
  return { id, admin, marketer, lead, viewer };
}

/** Creates a pipeline key through the product's API as the workspace admin. */
export async function createApiKey(
  workspace: TestWorkspace,
  permissions: ("ingest" | "read")[] = ["ingest"],
): Promise<{ id: string; key: string }> {
  const created = await workspace.admin.client.json<{ id: string; key: string }>("/api/v1/keys", {
    method: "POST",
    json: { name: "warehouse sync", permissions },
  });
  if (created.status !== 201) throw new Error(`key creation failed: ${created.status} ${JSON.stringify(created.body)}`);
  return created.body;
}
