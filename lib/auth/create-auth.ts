import { apiKey } from "@better-auth/api-key";
import { betterAuth, type BetterAuthPlugin } from "better-auth";
import { createAuthMiddleware } from "better-auth/api";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { organization } from "better-auth/plugins";
import { getDb } from "@/db";
import { listMemberships } from "@/db/queries/members";
import * as schema from "@/db/schema";
import { getEnv } from "@/lib/env";
import { sendInvitationMail, sendPasswordResetMail, sendVerificationMail } from "@/lib/mail/account-mail";
import { createAuthLog } from "./auth-logger";
import { KEY_PERMISSIONS, accessControl, roles } from "./permissions";
import { forgetMemberships, forgetSession, forgetUserSessions } from "./session-cache";

export const API_KEY_PREFIX = "psk_";

/** Pipeline keys push often: this many verifications a minute per key before 429. */
export const API_KEY_REQUESTS_PER_MINUTE = 600;

/** Builds the better-auth instance; the Next server adds `nextCookies()` as its last plugin. */
export function createAuth(extraPlugins: BetterAuthPlugin[] = [], options: { sendVerificationOnSignUp?: boolean } = {}) {
  const env = getEnv();
  const secure = env.SECURE_COOKIES ? env.SECURE_COOKIES === "true" : env.APP_URL.startsWith("https://");
  return betterAuth({
    appName: "Peeksafe",
    baseURL: env.APP_URL,
    secret: env.BETTER_AUTH_SECRET,
    trustedOrigins: [env.APP_URL],
    logger: { level: "warn", log: createAuthLog() },
    database: drizzleAdapter(getDb(), { provider: "pg", schema, usePlural: true }),
    advanced: {
      useSecureCookies: secure,
      defaultCookieAttributes: { httpOnly: true, sameSite: "lax", secure },
      database: { generateId: () => crypto.randomUUID() },
    },
    rateLimit: {
      enabled: env.AUTH_RATE_LIMIT === "on",
      storage: "database",
      window: 60,
      max: 100,
      customRules: {
        "/sign-in/email": { window: 60, max: 10 },
        "/sign-up/email": { window: 60, max: 10 },
        "/request-password-reset": { window: 60, max: 5 },
      },
    },
    // Route handlers cache sessions and memberships in-process (lib/auth/session-cache.ts): every change forgets them here.
    hooks: {
      after: createAuthMiddleware(async (context) => {
        if (context.path.startsWith("/organization/")) forgetMemberships();
      }),
    },
    databaseHooks: {
      user: {
        update: { after: async (user) => forgetUserSessions(user.id) },
        delete: { after: async (user) => forgetUserSessions(user.id) },
      },
      session: {
        update: { after: async (session) => forgetSession(session.token) },
        delete: { after: async (session) => forgetSession(session.token) },
        create: {
          // A new session opens in the user's first workspace, so every screen has one to show.
          before: async (session) => {
            if (session.activeOrganizationId) return { data: session };
            const first = (await listMemberships(session.userId))[0];
            return { data: { ...session, activeOrganizationId: first?.workspaceId ?? null } };
          },
        },
      },
    },
    emailAndPassword: {
      enabled: true,
      requireEmailVerification: true,
      minPasswordLength: 10,
      sendResetPassword: async ({ user, url }) => {
        await sendPasswordResetMail(user.email, url);
      },
    },
    emailVerification: {
      sendOnSignUp: options.sendVerificationOnSignUp ?? true,
      autoSignInAfterVerification: true,
      sendVerificationEmail: async ({ user, url }) => {
        await sendVerificationMail(user.email, url);
      },
    },
    plugins: [
      organization({
        ac: accessControl,
        roles,
        creatorRole: "admin",
        invitationExpiresIn: 7 * 24 * 60 * 60,
        sendInvitationEmail: async ({ email, inviter, organization: workspace, role, id }) => {
          await sendInvitationMail({
            to: email,
            inviter: inviter.user.name || inviter.user.email,
            workspace: workspace.name,
            role,
            url: `${env.APP_URL}/invitations/${id}`,
          });
        },
        schema: {
          organization: {
            additionalFields: {
              timeZone: { type: "string", required: false, defaultValue: "UTC", input: true },
            },
          },
        },
      }),
      apiKey({
        references: "organization",
        defaultPrefix: API_KEY_PREFIX,
        apiKeyHeaders: ["x-api-key"],
        enableSessionForAPIKeys: false,
        rateLimit: { enabled: true, timeWindow: 60_000, maxRequests: API_KEY_REQUESTS_PER_MINUTE },
        permissions: { defaultPermissions: { ...KEY_PERMISSIONS.ingest, ingest: [...KEY_PERMISSIONS.ingest.ingest] } },
      }),
      ...extraPlugins,
    ],
  });
}

export type Auth = ReturnType<typeof createAuth>;
