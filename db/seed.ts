import { randomUUID } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { closeDb, getDb } from "@/db";
import { members, organizations, users } from "@/db/schema";
import type { RoleName } from "@/lib/auth/permissions";
import { createAuth } from "@/lib/auth/create-auth";
import { seedDemoCampaigns } from "./demo-scenario";

/** The demo company of the local start: an invented outdoor-gear retailer. */
export const DEMO_WORKSPACE = { name: "Northwind Outfitters", slug: "northwind-outfitters", timeZone: "Europe/Berlin" };

export const DEMO_PASSWORD = "northwind-demo-2026";

export const DEMO_USERS: { email: string; name: string; role: RoleName }[] = [
  { email: "admin@northwind.example", name: "Maren Holt", role: "admin" },
  { email: "marketer@northwind.example", name: "Tomás Reyes", role: "marketer" },
  { email: "lead@northwind.example", name: "Priya Natarajan", role: "lead" },
  { email: "viewer@northwind.example", name: "Jonas Berg", role: "viewer" },
];

async function ensureUser(auth: ReturnType<typeof createAuth>, user: (typeof DEMO_USERS)[number]): Promise<string> {
  const db = getDb();
  const existing = await db.select({ id: users.id }).from(users).where(eq(users.email, user.email)).limit(1);
  if (existing[0]) return existing[0].id;
  const created = await auth.api.signUpEmail({ body: { email: user.email, password: DEMO_PASSWORD, name: user.name } });
  await db.update(users).set({ emailVerified: true }).where(eq(users.id, created.user.id));
  return created.user.id;
}

/** Creates the demo workspace and one verified user per role; safe to run again. Returns the workspace id. */
export async function seedDemoWorkspace(): Promise<string> {
  // Demo accounts are created verified: no confirmation mail to addresses nobody reads.
  const auth = createAuth([], { sendVerificationOnSignUp: false });
  const db = getDb();
  const ids = new Map<string, string>();
  for (const user of DEMO_USERS) ids.set(user.email, await ensureUser(auth, user));

  let workspace = (await db.select({ id: organizations.id }).from(organizations).where(eq(organizations.slug, DEMO_WORKSPACE.slug)).limit(1))[0];
  if (!workspace) {
    const created = await auth.api.createOrganization({
      body: { name: DEMO_WORKSPACE.name, slug: DEMO_WORKSPACE.slug, userId: ids.get(DEMO_USERS[0].email)!, timeZone: DEMO_WORKSPACE.timeZone },
    });
    if (!created) throw new Error("could not create the demo workspace");
    workspace = { id: created.id };
  }
  for (const user of DEMO_USERS.slice(1)) {
    const userId = ids.get(user.email)!;
    const member = await db
      .select({ id: members.id })
      .from(members)
      .where(and(eq(members.organizationId, workspace.id), eq(members.userId, userId)))
      .limit(1);
    if (!member[0]) {
      await db.insert(members).values({ id: randomUUID(), organizationId: workspace.id, userId, role: user.role, createdAt: new Date() });
    }
  }
  return workspace.id;
}

/**
 * Every demo step: the workspace and its users, the demo campaigns with their counts (once), then one
 * recompute pass so the dashboards have analyses and the first calls queue their alert e-mails (the
 * worker started beside the app sends them). Safe to run again: nothing is duplicated.
 */
export async function seedDemo(): Promise<{ workspaceId: string; campaignsCreated: number; alertsQueued: number }> {
  const workspaceId = await seedDemoWorkspace();
  const db = getDb();
  const userIdOf = async (role: RoleName) => {
    const email = DEMO_USERS.find((user) => user.role === role)!.email;
    const [row] = await db.select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
    return row.id;
  };
  const seeded = await seedDemoCampaigns(workspaceId, {
    createdBy: await userIdOf("marketer"),
    adminUserId: await userIdOf("admin"),
    timeZone: DEMO_WORKSPACE.timeZone,
  });
  const { runRecompute } = await import("@/cron/recompute");
  const summary = await runRecompute({ workspaceIds: [workspaceId], wait: true });
  return { workspaceId, campaignsCreated: seeded.filter((campaign) => campaign.created).length, alertsQueued: summary.alerts };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  seedDemo()
    .then(({ workspaceId, campaignsCreated, alertsQueued }) =>
      console.error(`[seed] demo workspace ${workspaceId} ready (${campaignsCreated} campaigns created, ${alertsQueued} alerts queued)`),
    )
    .finally(() => closeDb());
}
