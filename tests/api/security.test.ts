import { execFileSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it, vi } from "vitest";
import { getDb } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import { apikeys, campaigns } from "@/db/schema";
import { csvCell, toCsv } from "@/lib/csv-export";
import { startApp } from "../../scripts/lib/app-server";
import { freePort } from "../../scripts/lib/postgres-cluster";
import { createApiKey, createWorkspaceWithRoles, TEST_PASSWORD, type TestWorkspace } from "../factories";
import { campaignBody, countRow, createCampaign, dayFromToday, pushCounts } from "../factories-campaigns";
import { openBrowser } from "../helpers/browser";

// Security basics of issue 7 ("Access"), one test each.
const appUrl = inject("appUrl");
const FOREIGN_ORIGIN = "https://northwind-outfitters.attacker.example";

let northwind: TestWorkspace;
let campaign: CampaignDto;

beforeAll(async () => {
  northwind = await createWorkspaceWithRoles("Northwind Outfitters");
  campaign = await createCampaign(northwind);
}, 60_000);

function cookieAttributes(setCookie: string): { name: string; attributes: Set<string>; sameSite: string | null } {
  const [pair, ...rest] = setCookie.split(";").map((part) => part.trim());
  const attributes = new Set(rest.map((part) => part.split("=")[0].toLowerCase()));
  const sameSite = rest.find((part) => /^samesite=/i.test(part))?.split("=")[1]?.toLowerCase() ?? null;
  return { name: pair.slice(0, pair.indexOf("=")), attributes, sameSite };
}

async function signInResponse(baseUrl: string, email: string, password = TEST_PASSWORD): Promise<Response> {
  return fetch(new URL("/api/auth/sign-in/email", baseUrl), {
    method: "POST",
    headers: { origin: baseUrl, "content-type": "application/json" },
    body: JSON.stringify({ email, password }),
  });
}

describe("session cookies", () => {
  it("are HttpOnly and SameSite=Lax, and not Secure (nor __Secure-) on the plain-http loopback app", async () => {
    const response = await signInResponse(appUrl, northwind.viewer.email);
    expect(response.status).toBe(200);
    const cookies = response.headers.getSetCookie().map(cookieAttributes);
    const session = cookies.find((cookie) => /session_token$/.test(cookie.name));
    expect(session, cookies.map((cookie) => cookie.name).join(", ")).toBeDefined();
    for (const cookie of cookies) {
      expect(cookie.attributes.has("httponly"), cookie.name).toBe(true);
      expect(cookie.sameSite, cookie.name).toBe("lax");
      expect(cookie.attributes.has("secure"), cookie.name).toBe(false);
      expect(cookie.name.startsWith("__Secure-"), cookie.name).toBe(false);
    }
  });

  // A second server behind TLS is more than `npm test` needs: the same createAuth the app runs is built
  // in this process with an https APP_URL and asked to sign in through its own request handler.
  it("are Secure (and __Secure- prefixed) when APP_URL is https", async () => {
    const httpsUrl = "https://peeksafe.northwind.example";
    const saved = process.env.APP_URL;
    process.env.APP_URL = httpsUrl;
    vi.resetModules();
    try {
      const { createAuth } = await import("@/lib/auth/create-auth");
      const auth = createAuth();
      const response = await auth.handler(
        new Request(`${httpsUrl}/api/auth/sign-in/email`, {
          method: "POST",
          headers: { origin: httpsUrl, "content-type": "application/json" },
          body: JSON.stringify({ email: northwind.lead.email, password: TEST_PASSWORD }),
        }),
      );
      expect(response.status).toBe(200);
      const cookies = response.headers.getSetCookie().map(cookieAttributes);
      expect(cookies.some((cookie) => /session_token$/.test(cookie.name))).toBe(true);
      for (const cookie of cookies) {
        expect(cookie.attributes.has("secure"), cookie.name).toBe(true);
        expect(cookie.attributes.has("httponly"), cookie.name).toBe(true);
        expect(cookie.sameSite, cookie.name).toBe("lax");
        expect(cookie.name.startsWith("__Secure-"), cookie.name).toBe(true);
      }
    } finally {
      process.env.APP_URL = saved;
      vi.resetModules();
    }
  });
});

describe("CSRF: state-changing requests with a session from another origin", () => {
  const attempts = () => [
    { method: "POST", path: "/api/v1/campaigns", json: campaignBody({ name: "Forged campaign" }) },
    { method: "PATCH", path: `/api/v1/campaigns/${campaign.id}`, json: { name: "Forged name" } },
    { method: "POST", path: `/api/v1/campaigns/${campaign.id}/decisions`, json: { outcome: "ship", note: "forged" } },
    { method: "PUT", path: `/api/v1/campaigns/${campaign.id}/subscription` },
    { method: "POST", path: "/api/v1/keys", json: { name: "forged key", permissions: ["ingest"] } },
    { method: "POST", path: "/api/auth/organization/create", json: { name: "Forged workspace", slug: "forged-workspace-csrf" } },
    { method: "POST", path: "/api/auth/organization/invite-member", json: { email: "forged@northwind-test.example", role: "admin", organizationId: northwind.id } },
    { method: "POST", path: "/api/auth/sign-out", json: {} },
  ];

  it("are refused with 403 for our routes and better-auth's, with a foreign Origin or none, and change nothing", async () => {
    const keysBefore = await getDb().select({ id: apikeys.id }).from(apikeys).where(eq(apikeys.referenceId, northwind.id));
    for (const origin of [FOREIGN_ORIGIN, null, "null", appUrl.replace("127.0.0.1", "localhost")]) {
      for (const attempt of attempts()) {
        // An empty Origin stands for none: the test client fills in our own when the header is absent.
        const response = await northwind.admin.client.fetch(attempt.path, { method: attempt.method, json: attempt.json, headers: { origin: origin ?? "" } });
        const label = `${attempt.method} ${attempt.path} from ${origin ?? "no origin"}: ${response.status}`;
        expect(response.status, label).toBe(403);
      }
    }
    const [stored] = await getDb().select({ name: campaigns.name }).from(campaigns).where(eq(campaigns.id, campaign.id));
    expect(stored.name).toBe(campaign.name);
    expect(await getDb().select({ id: apikeys.id }).from(apikeys).where(eq(apikeys.referenceId, northwind.id))).toHaveLength(keysBefore.length);
    // The session survived the forged sign-out.
    expect((await northwind.admin.client.fetch("/api/v1/whoami")).status).toBe(200);
  });
});

describe("security headers", () => {
  for (const target of ["/sign-in", "/campaigns", "/api/health", "/api/v1/campaigns", "/api/v1/openapi.json"]) {
    it(`are sent on ${target}`, async () => {
      const response = await northwind.viewer.client.fetch(target);
      expect(response.status).toBeLessThan(400);
      const csp = response.headers.get("content-security-policy") ?? "";
      expect(csp).toMatch(/default-src 'self'/);
      expect(csp).toMatch(/frame-ancestors 'none'/);
      expect(csp).toMatch(/object-src 'none'/);
      expect(csp).not.toMatch(/unsafe-eval/);
      expect(response.headers.get("x-content-type-options")).toBe("nosniff");
      expect(response.headers.get("referrer-policy")).toBe("strict-origin-when-cross-origin");
      expect(response.headers.get("x-frame-options")).toBe("DENY");
      expect(response.headers.get("x-powered-by")).toBeNull();
    });
  }

  it("let the app work in Chromium with no Content-Security-Policy violation", { timeout: 90_000 }, async () => {
    const browser = await openBrowser();
    try {
      const { page, errors } = browser;
      await page.addInitScript(() => {
        const seen: string[] = [];
        (window as unknown as { cspViolations: string[] }).cspViolations = seen;
        document.addEventListener("securitypolicyviolation", (event) => seen.push(`${location.pathname}: ${event.violatedDirective} ${event.blockedURI} at ${event.sourceFile}:${event.lineNumber}:${event.columnNumber} (${event.sample})`));
      });
      const violations: string[] = [];
      const collect = async () => violations.push(...(await page.evaluate(() => (window as unknown as { cspViolations: string[] }).cspViolations)));
      // Signing in through the form needs the client bundle to run: the policy must not block it.
      await page.goto(`${appUrl}/sign-in`);
      await page.getByLabel("E-mail").fill(northwind.marketer.email);
      await page.getByLabel("Password").fill(TEST_PASSWORD);
      await collect();
      await page.getByRole("button", { name: "Sign in" }).click();
      await page.waitForURL(/\/campaigns/);
      await page.goto(`${appUrl}/campaigns/${campaign.id}`);
      await page.waitForLoadState("networkidle");
      await page.getByText(campaign.name).first().waitFor();
      await collect();
      await page.goto(`${appUrl}/planner`);
      await page.waitForLoadState("networkidle");
      await collect();
      expect(violations).toEqual([]);
      expect(errors.filter((error) => /content security policy|refused to/i.test(error))).toEqual([]);
    } finally {
      await browser.close();
    }
  });
});

describe("API keys", () => {
  it("are stored hashed: the database row never holds the key", async () => {
    const created = await createApiKey(northwind, ["ingest"]);
    expect(created.key.startsWith("psk_")).toBe(true);
    const [row] = await getDb().select({ key: apikeys.key, start: apikeys.start }).from(apikeys).where(eq(apikeys.id, created.id));
    expect(row.key).not.toBe(created.key);
    expect(row.key).not.toContain(created.key.slice(4));
    expect(row.key.length).toBeGreaterThanOrEqual(32);
    // Only a short prefix is kept to tell keys apart on the settings screen.
    expect((row.start ?? "").length).toBeLessThanOrEqual(10);
  });

  it("answer 429 with Retry-After once a key exceeds its rate limit", async () => {
    const created = await createApiKey(northwind, ["ingest"]);
    await getDb().update(apikeys).set({ rateLimitMax: 2 }).where(eq(apikeys.id, created.id));
    const rows = [countRow(campaign.id, "holdout", dayFromToday(-1), 100, 5)];
    const statuses: number[] = [];
    let limited: Awaited<ReturnType<typeof pushCounts>> | undefined;
    for (let attempt = 0; attempt < 4 && !limited; attempt++) {
      const response = await pushCounts(created.key, rows);
      statuses.push(response.status);
      if (response.status === 429) limited = response;
    }
    expect(statuses.slice(0, 2)).toEqual([200, 200]);
    expect(limited, statuses.join(", ")).toBeDefined();
    expect(limited!.response.headers.get("content-type")).toMatch(/^application\/problem\+json/);
    const retryAfter = Number(limited!.response.headers.get("retry-after"));
    expect(Number.isInteger(retryAfter) && retryAfter >= 1 && retryAfter <= 60, String(retryAfter)).toBe(true);
    expect(limited!.body.status).toBe(429);
  });
});

describe("sign-in rate limit (a second app from the same build with AUTH_RATE_LIMIT=on)", () => {
  let limitedApp: Awaited<ReturnType<typeof startApp>> | undefined;

  afterAll(async () => {
    await limitedApp?.stop();
  });

  it("answers 429 once one address has tried 10 sign-ins within a minute", { timeout: 60_000 }, async () => {
    const port = await freePort();
    limitedApp = await startApp({
      port,
      quiet: true,
      env: {
        ...process.env,
        DATABASE_URL: inject("databaseUrl"),
        BETTER_AUTH_SECRET: inject("authSecret"),
        APP_URL: `http://127.0.0.1:${port}`,
        SMTP_URL: inject("smtpUrl"),
        MAIL_CATCHER_URL: inject("mailUrl"),
        AUTH_RATE_LIMIT: "on",
        LOG_LEVEL: "warn",
      },
    });
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 12; attempt++) {
      statuses.push((await signInResponse(limitedApp.url, northwind.viewer.email, "not-the-password-1")).status);
    }
    // better-auth counts the attempt that reaches `max` as over the limit: 9 pass, then 429 until the window ends.
    const firstRefused = statuses.indexOf(429);
    expect(firstRefused, statuses.join(", ")).toBeGreaterThanOrEqual(5);
    expect(firstRefused, statuses.join(", ")).toBeLessThanOrEqual(10);
    expect(statuses.slice(0, firstRefused).every((status) => status === 401), statuses.join(", ")).toBe(true);
    expect(statuses.slice(firstRefused).every((status) => status === 429), statuses.join(", ")).toBe(true);
    // The right password is refused too while the window lasts: the limit is per address, not per guess.
    const blocked = await signInResponse(limitedApp.url, northwind.viewer.email);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers.get("x-retry-after") ?? blocked.headers.get("retry-after"))).toBeGreaterThan(0);
    // The test app runs with the limit off, so this address is not blocked there.
    expect((await signInResponse(appUrl, northwind.viewer.email)).status).toBe(200);
  });
});

/** Every file under `folder`, recursively. */
function filesUnder(folder: string): string[] {
  return readdirSync(folder, { recursive: true, withFileTypes: true }).filter((entry) => entry.isFile()).map((entry) => path.join(entry.parentPath, entry.name));
}

describe("secrets", () => {
  it("are absent from the client bundle (the signing secret, the database address, keys, private keys)", () => {
    const folder = path.resolve(process.env.NEXT_DIST_DIR ?? ".next", "static");
    expect(existsSync(folder), folder).toBe(true);
    const databaseUrl = new URL(inject("databaseUrl"));
    const demoSecretFile = path.resolve(".data/auth-secret");
    const needles = [
      inject("authSecret"),
      inject("databaseUrl"),
      databaseUrl.password ? decodeURIComponent(databaseUrl.password) : "",
      existsSync(demoSecretFile) ? readFileSync(demoSecretFile, "utf8").trim() : "",
      "postgres://",
      "postgresql://",
    ].filter((needle) => needle.length >= 8);
    const patterns = [/psk_[A-Za-z0-9_-]{20,}/, /-----BEGIN [A-Z ]*PRIVATE KEY-----/];
    const files = filesUnder(folder).filter((file) => /\.(js|css|json|map|txt|html)$/.test(file));
    expect(files.length).toBeGreaterThan(10);
    const findings: string[] = [];
    for (const file of files) {
      const text = readFileSync(file, "utf8");
      for (const needle of needles) if (text.includes(needle)) findings.push(`${path.relative(folder, file)} contains ${needle === inject("authSecret") ? "the signing secret" : needle.slice(0, 12)}`);
      for (const pattern of patterns) if (pattern.test(text)) findings.push(`${path.relative(folder, file)} matches ${pattern}`);
    }
    expect(findings).toEqual([]);
  });

  it("the signing secret is generated at first start into .data/, which git never tracks", () => {
    const tracked = execFileSync("git", ["ls-files"], { encoding: "utf8" }).split("\n");
    expect(tracked.filter((file) => file.startsWith(".data/") || file.includes("/.data/") || /auth-secret$/.test(file) || /^\.env(\.|$)/.test(file))).toEqual([]);
    expect(readFileSync(".gitignore", "utf8").split("\n")).toContain(".data/");
    const start = readFileSync("scripts/start-stack.ts", "utf8");
    expect(start).toMatch(/randomBytes\(32\)/);
    expect(start).toMatch(/auth-secret/);
  });
});

describe("CSV downloads", () => {
  it("escape cells that a spreadsheet would read as a formula (OWASP CSV injection) and quote per RFC 4180", () => {
    for (const formula of ["=1+1", "+41", "-2+3", "@SUM(A1:A2)", "\t=cmd", "\r=cmd", "=HYPERLINK(\"http://x\",\"y\")"]) {
      const cell = csvCell(formula);
      const unquoted = cell.startsWith('"') ? cell.slice(1, -1).replace(/""/g, '"') : cell;
      expect(unquoted.startsWith("'"), `${JSON.stringify(formula)} → ${cell}`).toBe(true);
    }
    expect(csvCell("Trail shoes, spring")).toBe('"Trail shoes, spring"');
    expect(csvCell('He said "ship"')).toBe('"He said ""ship"""');
    expect(csvCell(-0.012)).toBe("-0.012");
    expect(csvCell(Number.NaN)).toBe("");
    expect(csvCell(null)).toBe("");
    expect(toCsv(["campaign", "lift"], [["=2+5 Northwind", 0.04]])).toBe("campaign,lift\r\n'=2+5 Northwind,0.04\r\n");
  });
});
