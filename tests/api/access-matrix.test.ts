import { randomUUID } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, inject, it } from "vitest";
import { getPool } from "@/db";
import type { CampaignDto } from "@/db/queries/campaigns";
import { createApiKey, createUser, createWorkspace, createWorkspaceWithRoles, type TestUser, type TestWorkspace } from "../factories";
import { createCampaign } from "../factories-campaigns";
import { TestClient } from "../helpers/http-client";

// Every route handler × method × caller, against DESIGN.md §2 (issue 7, "Access"). The routes are read from
// app/api at test time: a new route or method without an entry below fails the first test.

const CALLERS = ["anonymous", "admin", "marketer", "lead", "viewer", "otherAdmin", "ingestKey", "readKey", "revokedKey"] as const;
type CallerName = (typeof CALLERS)[number];

/** `pass`: got past authorization (any status but 401/403, never 5xx); a number: exactly that status. */
type Expected = "pass" | 401 | 403 | 404 | readonly number[];
type Row = Record<CallerName, Expected>;

interface Fixtures {
  campaign: CampaignDto;
  otherCampaign: CampaignDto;
}

interface Cell {
  method: string;
  path: (fixtures: Fixtures) => string;
  body?: (fixtures: Fixtures) => unknown;
  headers?: Record<string, string>;
  expected: Row;
}

/** Members only; each role in `roles` passes. Keys are refused before they are checked (403). */
function sessionOnly(roles: CallerName[], otherAdmin: Expected): Row {
  return {
    anonymous: 401,
    admin: roles.includes("admin") ? "pass" : 403,
    marketer: roles.includes("marketer") ? "pass" : 403,
    lead: roles.includes("lead") ? "pass" : 403,
    viewer: roles.includes("viewer") ? "pass" : 403,
    otherAdmin,
    ingestKey: 403,
    readKey: 403,
    revokedKey: 403,
  };
}

/** Every member reads; the read key reads; the ingest key lacks the permission; a revoked key is unknown. */
function readable(otherAdmin: Expected): Row {
  return { anonymous: 401, admin: "pass", marketer: "pass", lead: "pass", viewer: "pass", otherAdmin, ingestKey: 403, readKey: "pass", revokedKey: 401 };
}

const everyone = (expected: Expected): Row => Object.fromEntries(CALLERS.map((caller) => [caller, expected])) as Row;
const ALL_ROLES: CallerName[] = ["admin", "marketer", "lead", "viewer"];
const id = (fixtures: Fixtures) => fixtures.campaign.id;

const MATRIX: Record<string, Cell[]> = {
  // Addresses no route answers: the same problem 404 for everybody, whatever the credential.
  "[...path]": (["DELETE", "GET", "PATCH", "POST", "PUT"] as const).map((method) => ({ method, path: () => "/api/v1/no-such-route", expected: everyone(404) })),
  "auth/[...all]": [
    { method: "GET", path: () => "/api/auth/get-session", expected: everyone("pass") },
    // better-auth's own API-key endpoint must not be a way around /api/v1/keys: only this workspace's admin creates its keys.
    {
      method: "POST",
      path: () => "/api/auth/api-key/create",
      body: () => ({ name: "matrix", organizationId: "<workspace>" }),
      expected: { ...everyone([400, 401, 403, 404]), admin: "pass" },
    },
    // Members are managed by admins only, through better-auth's workspace endpoints.
    {
      method: "POST",
      path: () => "/api/auth/organization/invite-member",
      body: () => ({ email: `invited.${randomUUID().slice(0, 8)}@northwind-test.example`, role: "viewer", organizationId: "<workspace>" }),
      expected: { ...everyone([400, 401, 403, 404]), admin: "pass" },
    },
  ],
  "cron/[job]": [{ method: "POST", path: () => "/api/cron/recompute", expected: everyone([403, 404]) }],
  "dev/mail": [{ method: "GET", path: () => "/api/dev/mail", expected: everyone("pass") }],
  health: [{ method: "GET", path: () => "/api/health", expected: everyone("pass") }],
  "v1/campaigns": [
    { method: "GET", path: () => "/api/v1/campaigns", expected: readable("pass") },
    { method: "POST", path: () => "/api/v1/campaigns", body: () => ({}), expected: { ...readable("pass"), lead: 403, viewer: 403, readKey: 403 } },
  ],
  "v1/campaigns/[id]": [
    { method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}`, expected: readable(404) },
    { method: "PATCH", path: (f) => `/api/v1/campaigns/${id(f)}`, body: (f) => ({ name: f.campaign.name }), expected: sessionOnly(["admin", "marketer"], 404) },
  ],
  "v1/campaigns/[id]/counts": [
    { method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/counts`, expected: readable(404) },
    { method: "POST", path: (f) => `/api/v1/campaigns/${id(f)}/counts`, body: () => "not,a,counts,file\n", headers: { "content-type": "text/csv" }, expected: sessionOnly(["admin", "marketer"], 404) },
  ],
  "v1/campaigns/[id]/decisions": [
    { method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/decisions`, expected: sessionOnly(ALL_ROLES, 404) },
    { method: "POST", path: (f) => `/api/v1/campaigns/${id(f)}/decisions`, body: () => ({ outcome: "not-an-outcome" }), expected: sessionOnly(["admin", "lead"], 404) },
  ],
  "v1/campaigns/[id]/recompute": [
    { method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/recompute`, expected: readable(404) },
    { method: "POST", path: (f) => `/api/v1/campaigns/${id(f)}/recompute`, expected: sessionOnly(["admin", "lead"], 404) },
  ],
  "v1/campaigns/[id]/series": [{ method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/series`, expected: readable(404) }],
  "v1/campaigns/[id]/status": [{ method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/status`, expected: readable(404) }],
  "v1/campaigns/[id]/subscription": [
    { method: "GET", path: (f) => `/api/v1/campaigns/${id(f)}/subscription`, expected: sessionOnly(ALL_ROLES, 404) },
    { method: "PUT", path: (f) => `/api/v1/campaigns/${id(f)}/subscription`, expected: sessionOnly(ALL_ROLES, 404) },
    { method: "DELETE", path: (f) => `/api/v1/campaigns/${id(f)}/subscription`, expected: sessionOnly(ALL_ROLES, 404) },
  ],
  "v1/ingest": [
    {
      method: "POST",
      path: () => "/api/v1/ingest",
      body: () => ({ rows: [] }),
      headers: { "idempotency-key": "matrix" },
      expected: { ...everyone(401), ingestKey: "pass", readKey: 403 },
    },
  ],
  "v1/keys": [
    { method: "GET", path: () => "/api/v1/keys", expected: sessionOnly(["admin"], "pass") },
    { method: "POST", path: () => "/api/v1/keys", body: () => ({}), expected: sessionOnly(["admin"], "pass") },
  ],
  "v1/keys/[id]": [{ method: "DELETE", path: () => `/api/v1/keys/${randomUUID()}`, expected: sessionOnly(["admin"], "pass") }],
  "v1/openapi.json": [{ method: "GET", path: () => "/api/v1/openapi.json", expected: everyone("pass") }],
  "v1/planner": [{ method: "GET", path: () => "/api/v1/planner?baselineRate=0.05&minimumLift=0.1", expected: readable("pass") }],
  "v1/portfolio": [{ method: "GET", path: () => "/api/v1/portfolio", expected: readable("pass") }],
  "v1/whoami": [{ method: "GET", path: () => "/api/v1/whoami", expected: { ...readable("pass"), ingestKey: "pass" } }],
};

/** Every `app/api/**\/route.ts`, as its folder under app/api, with the HTTP methods it exports. */
function routeHandlers(): Map<string, string[]> {
  const root = path.resolve("app/api");
  const found = new Map<string, string[]>();
  for (const entry of readdirSync(root, { recursive: true, withFileTypes: true })) {
    if (!entry.isFile() || entry.name !== "route.ts") continue;
    const file = path.join(entry.parentPath, entry.name);
    const source = readFileSync(file, "utf8");
    const methods = [...source.matchAll(/export\s+(?:async\s+function|function|const)\s+(GET|POST|PUT|PATCH|DELETE|HEAD|OPTIONS)\b/g)].map((match) => match[1]);
    found.set(path.relative(root, entry.parentPath).split(path.sep).join("/"), [...new Set(methods)].sort());
  }
  return found;
}

let northwind: TestWorkspace;
let otherAdmin: TestUser;
let otherWorkspaceId: string;
let fixtures: Fixtures;
let keys: { ingest: string; read: string; revoked: string };

beforeAll(async () => {
  [northwind, otherAdmin] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createUser({ name: "Other admin" })]);
  otherWorkspaceId = await createWorkspace(otherAdmin, "Northwind Outfitters EU");
  const otherWorkspace = { id: otherWorkspaceId, admin: otherAdmin } as TestWorkspace;
  const [campaign, otherCampaign] = await Promise.all([createCampaign(northwind), createCampaign({ ...otherWorkspace, marketer: otherAdmin })]);
  fixtures = { campaign, otherCampaign };
  const [ingest, read, revoked] = await Promise.all([createApiKey(northwind, ["ingest"]), createApiKey(northwind, ["read"]), createApiKey(northwind, ["ingest", "read"])]);
  expect((await northwind.admin.client.fetch(`/api/v1/keys/${revoked.id}`, { method: "DELETE" })).status).toBe(204);
  keys = { ingest: ingest.key, read: read.key, revoked: revoked.key };
}, 60_000);

async function call(caller: CallerName, cell: Cell): Promise<Response> {
  const url = cell.path(fixtures);
  let body = cell.body?.(fixtures);
  if (body && typeof body === "object") body = JSON.parse(JSON.stringify(body).replaceAll("<workspace>", northwind.id));
  const headers: Record<string, string> = { ...cell.headers };
  if (body !== undefined && !headers["content-type"]) headers["content-type"] = "application/json";
  const init: RequestInit = { method: cell.method, headers, body: body === undefined ? undefined : typeof body === "string" ? body : JSON.stringify(body) };
  // Anonymous is a browser without a session: it sends our Origin, so the answer is 401, not the CSRF 403.
  if (caller === "anonymous") return new TestClient().fetch(url, init);
  const user = { admin: northwind.admin, marketer: northwind.marketer, lead: northwind.lead, viewer: northwind.viewer, otherAdmin }[caller as string];
  if (user) return user.client.fetch(url, init);
  const key = { ingestKey: keys.ingest, readKey: keys.read, revokedKey: keys.revoked }[caller as string];
  if (key) headers.authorization = `Bearer ${key}`;
  return fetch(new URL(url, inject("appUrl")), { ...init, headers, redirect: "manual" });
}

/** Values that must never appear in any response: password hashes, stored key hashes, session tokens (with their owner). */
async function secrets(): Promise<{ value: string; sessionOf: string | null }[]> {
  const pool = getPool();
  const passwords = await pool.query<{ value: string }>("select password as value from accounts where password is not null");
  const keyHashes = await pool.query<{ value: string }>("select key as value from apikeys");
  const tokens = await pool.query<{ value: string; user_id: string }>("select token as value, user_id from sessions");
  return [
    ...passwords.rows.map((row) => ({ value: row.value, sessionOf: null })),
    ...keyHashes.rows.map((row) => ({ value: row.value, sessionOf: null })),
    ...tokens.rows.map((row) => ({ value: row.value, sessionOf: row.user_id })),
  ].filter((secret) => secret.value.length >= 16);
}

/** A problem's `instance` echoes the caller's own URL (with the id it asked for); that is not the other workspace's data. */
function withoutInstance(text: string): string {
  try {
    const body = JSON.parse(text) as Record<string, unknown>;
    if (body && typeof body === "object" && "instance" in body) delete body.instance;
    return JSON.stringify(body);
  } catch {
    return text;
  }
}

describe("access matrix over every route handler", () => {
  it("has an entry for every route file and every method it exports, and none for routes that are gone", () => {
    const handlers = routeHandlers();
    const listed = new Map(Object.entries(MATRIX).map(([route, cells]) => [route, [...new Set(cells.map((cell) => cell.method))].sort()]));
    expect(Object.fromEntries(listed)).toEqual(Object.fromEntries(handlers));
  });

  it("answers each caller as DESIGN.md §2 says, and never leaks a secret or the other workspace's data", async () => {
    const failures: string[] = [];
    const responses: { caller: CallerName; route: string; text: string }[] = [];
    for (const [route, cells] of Object.entries(MATRIX)) {
      for (const cell of cells) {
        for (const caller of CALLERS) {
          const response = await call(caller, cell);
          const text = await response.text();
          responses.push({ caller, route: `${cell.method} ${route}`, text });
          const expected = cell.expected[caller];
          const label = `${cell.method} ${cell.path(fixtures)} as ${caller}: got ${response.status} ${text.slice(0, 160)}`;
          if (response.status >= 500) failures.push(`${label} (5xx)`);
          else if (expected === "pass" ? [401, 403].includes(response.status) : Array.isArray(expected) ? !expected.includes(response.status) : response.status !== expected) {
            failures.push(`${label}, expected ${JSON.stringify(expected)}`);
          }
          if (response.status >= 400 && response.status < 500 && route !== "auth/[...all]") {
            expect(response.headers.get("content-type"), label).toMatch(/^application\/problem\+json/);
          }
        }
      }
    }
    expect(failures).toEqual([]);

    const secretValues = await secrets();
    const northwindIds = [northwind.id, fixtures.campaign.id];
    const otherIds = [otherWorkspaceId, fixtures.otherCampaign.id];
    for (const { caller, route, text } of responses) {
      // The local mailbox is the development fake for SMTP, off whenever real SMTP is configured (README).
      if (route === "GET dev/mail") continue;
      const userId = { admin: northwind.admin.id, marketer: northwind.marketer.id, lead: northwind.lead.id, viewer: northwind.viewer.id, otherAdmin: otherAdmin.id }[caller as string];
      for (const secret of secretValues) {
        // better-auth's get-session echoes the caller's own session token (unsigned: the cookie needs its HMAC too).
        if (route === "GET auth/[...all]" && secret.sessionOf !== null && secret.sessionOf === userId) continue;
        expect(text.includes(secret.value), `${route} as ${caller} carries a secret`).toBe(false);
      }
      const withoutEcho = withoutInstance(text);
      for (const foreignId of caller === "otherAdmin" ? northwindIds : otherIds) {
        expect(withoutEcho.includes(foreignId), `${route} as ${caller} carries another workspace's id`).toBe(false);
      }
    }
  }, 90_000);
});
