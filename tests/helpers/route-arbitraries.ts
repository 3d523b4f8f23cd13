import fc from "fast-check";
import type { CampaignDto } from "@/db/queries/campaigns";
import { createApiKey, createWorkspaceWithRoles, type TestWorkspace } from "../factories";
import { createCampaign, dayFromToday } from "../factories-campaigns";
import { expectNoServerError } from "./fuzz-expect";

// Bad path ids, query parameters and bodies for every REST route under app/api (issue 7, "Bad input"),
// shared by tests/api/fuzz-routes.test.ts and the long soak script.

/** A workspace whose admin is signed in, a read key, one of its campaigns and a campaign of another workspace. */
export interface RouteFuzzWorld {
  appUrl: string;
  northwind: TestWorkspace;
  other: TestWorkspace;
  readKey: string;
  campaign: CampaignDto;
  foreign: CampaignDto;
}

export async function createRouteFuzzWorld(appUrl: string): Promise<RouteFuzzWorld> {
  const [northwind, other] = await Promise.all([createWorkspaceWithRoles("Northwind Outfitters"), createWorkspaceWithRoles("Northwind Outfitters EU")]);
  const { key } = await createApiKey(northwind, ["read"]);
  const campaign = await createCampaign(northwind, { startDate: dayFromToday(-10) });
  const foreign = await createCampaign(other, { startDate: dayFromToday(-10) });
  return { appUrl, northwind, other, readKey: key, campaign, foreign };
}

type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

/**
 * One route handler: its path with `:id` where a generated id goes, its methods, and whether a real
 * campaign id may be used with each (only where bad query or body alone cannot write anything).
 */
interface RouteSpec {
  path: string;
  reads: Method[];
  /** Methods that change state: called with a valid id only together with a body that cannot be valid. */
  writesWithBody: Method[];
  /** Methods that change state with no body at all: called with bad ids only. */
  writesWithoutBody: Method[];
}

/** Every route handler under app/api (better-auth's own mount aside) and the unsubscribe endpoint. */
export const ROUTES: RouteSpec[] = [
  { path: "/api/health", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/dev/mail", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/cron/:job", reads: [], writesWithBody: [], writesWithoutBody: ["POST"] },
  { path: "/api/v1/openapi.json", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/whoami", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/planner", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/portfolio", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/keys", reads: ["GET"], writesWithBody: ["POST"], writesWithoutBody: [] },
  { path: "/api/v1/keys/:id", reads: [], writesWithBody: [], writesWithoutBody: ["DELETE"] },
  { path: "/api/v1/campaigns", reads: ["GET"], writesWithBody: ["POST"], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id", reads: ["GET"], writesWithBody: ["PATCH"], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id/counts", reads: ["GET"], writesWithBody: ["POST"], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id/decisions", reads: ["GET"], writesWithBody: ["POST"], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id/recompute", reads: ["GET"], writesWithBody: [], writesWithoutBody: ["POST"] },
  { path: "/api/v1/campaigns/:id/series", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id/status", reads: ["GET"], writesWithBody: [], writesWithoutBody: [] },
  { path: "/api/v1/campaigns/:id/subscription", reads: ["GET"], writesWithBody: [], writesWithoutBody: ["PUT", "DELETE"] },
  { path: "/api/v1/ingest", reads: [], writesWithBody: ["POST"], writesWithoutBody: [] },
  { path: "/unsubscribe/confirm", reads: [], writesWithBody: [], writesWithoutBody: ["POST"] },
];

export interface RouteCase {
  route: string;
  method: Method;
  /** The path as sent, already percent-encoded (or deliberately broken). */
  path: string;
  query: [string, string][];
  caller: "admin" | "key" | "anonymous";
  headers: Record<string, string>;
  body?: string | Uint8Array;
}

/**
 * Path segments that name nothing of ours: not uuids, huge, unicode, traversal, encoded NUL and newline, and
 * percent-encodings that do not decode (proxy.ts answers those before Next's router would answer 500).
 */
const badSegment: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom(
    "not-a-uuid",
    "0",
    "-1",
    "1e308",
    "00000000-0000-0000-0000-000000000000",
    "x".repeat(141),
    "x".repeat(4000),
    "..",
    "..%2F..%2Fkeys",
    "%2e%2e%2f%2e%2e%2fhealth",
    "%00",
    "%F0%9F%99%82",
    "%C3%A4%CC%88",
    "'%20or%201%3D1%20--",
    "%20",
    "null",
    "undefined",
    "%5B%5D",
    "%7B%7D",
    "a%0Ab",
    "%FF",
    "%",
    "%E0%A4%A",
    "%C3%28",
    "%ZZ",
    "%u0041",
  ),
  fc.string({ minLength: 1, maxLength: 40, unit: "grapheme" }).map((text) => encodeURIComponent(text)),
  fc.uuid().map((id) => id.toUpperCase()),
);

const badQueryValue: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom("", " ", "-1", "0", "1.5", "NaN", "Infinity", "-Infinity", "1e308", "9".repeat(400), "true", "null", "[]", "{}", "running", "RUNNING", "draft,running", "\u0000", "🙂", "x".repeat(5000), "2026-02-30", "0x10"),
  fc.string({ maxLength: 30, unit: "grapheme" }),
  fc.double().map(String),
  fc.integer().map(String),
);

const queryKey: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom("status", "baselineRate", "minimumLift", "alpha", "power", "sides", "holdoutShare", "dailyUnits", "kind", "metric", "days", "from", "to", "limit", "offset", "cursor", "token", "__proto__", "constructor", "a[b]"),
  fc.string({ minLength: 1, maxLength: 12 }),
);

const badQuery = fc.array(fc.tuple(queryKey, badQueryValue), { maxLength: 6 });

/** A value no field of ours accepts: wrong types, and strings longer than any field's limit. */
const wrongTypedValue: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom<unknown>(true, false, [], [1, "a"], -1.5, 1e308, "x".repeat(2500), { nested: { deeper: [] } }),
  fc.array(fc.integer(), { minLength: 1, maxLength: 3 }),
);

const knownField = fc.constantFrom("name", "status", "hypothesis", "plan", "startDate", "maxDays", "dailyUnits", "reason", "outcome", "note", "permissions", "metric", "arms", "alpha", "baselineRate", "rows", "token");

/** JSON text no body schema of ours accepts, as it would arrive at a handler. */
const badJsonBody: fc.Arbitrary<string | Uint8Array> = fc.oneof(
  fc.constantFrom<unknown>(null, 0, -1, "", "text", [], [{}], true).map((value) => JSON.stringify(value)),
  fc.dictionary(knownField, wrongTypedValue, { minKeys: 1, maxKeys: 4 }).map((value) => JSON.stringify(value)),
  fc.record({ unexpected: fc.string(), __proto__: fc.constant({ admin: true }) }).map((value) => JSON.stringify(value)),
  fc.integer({ min: 100, max: 20_000 }).map((depth) => "[".repeat(depth) + "]".repeat(depth)),
  fc.integer({ min: 100, max: 5_000 }).map((depth) => '{"a":'.repeat(depth) + "1" + "}".repeat(depth)),
  fc.constantFrom("{", "}", "[1,", "{'a':1}", "{\"a\":NaN}", "\u0000", "\uFEFF{}", "undefined").map((text) => text),
  fc.constant(JSON.stringify({ name: "x".repeat(70_000) })),
  fc.uint8Array({ minLength: 1, maxLength: 64 }).map((bytes) => Uint8Array.from([0x7b, 0x22, 0xff, 0xfe, ...bytes])),
  fc.constant(Buffer.concat([Buffer.from('{"name":"Trail'), Buffer.from([0xc3, 0x28, 0xa0, 0xa1]), Buffer.from('"}')])),
);

const contentType = fc.constantFrom("application/json", "application/json; charset=latin1", "text/plain", "text/csv", "application/x-www-form-urlencoded", "multipart/form-data; boundary=x", "application/xml", "");

const badHeaders: fc.Arbitrary<Record<string, string>> = fc.oneof(
  { arbitrary: fc.constant({}), weight: 6 },
  { arbitrary: fc.constantFrom<Record<string, string>>({ "x-cron-secret": "wrong" }, { "x-cron-secret": "" }, { "x-cron-secret": "x".repeat(5000) }, { "idempotency-key": "x".repeat(300) }, { accept: "text/csv" }), weight: 1 },
);

/** Generated calls to every route: bad ids, bad query parameters, bad bodies and content types. */
export function routeArbitraries(world: RouteFuzzWorld) {
  const anyId = fc.oneof({ arbitrary: badSegment, weight: 4 }, { arbitrary: fc.constant(world.foreign.id), weight: 1 }, { arbitrary: fc.constant(world.foreign.slug), weight: 1 });
  const ownId = fc.constantFrom(world.campaign.id, world.campaign.slug);
  const jobSegment = fc.oneof(fc.constantFrom("recompute", "nightly", "mailer", "digest", "RECOMPUTE", "recompute%00"), badSegment);
  const caller = fc.constantFrom<RouteCase["caller"]>("admin", "admin", "admin", "key", "anonymous");

  const cases = ROUTES.flatMap((route) => {
    const hasId = route.path.includes(":id");
    const fill = (id: string) => route.path.replace(":id", id).replace(":job", id);
    const idFor = (valid: boolean) => (route.path.includes(":job") ? jobSegment : hasId ? (valid ? fc.oneof(anyId, ownId) : anyId) : fc.constant(""));
    const make = (method: Method, id: fc.Arbitrary<string>, body: fc.Arbitrary<string | Uint8Array | undefined>) =>
      fc.record({ id, query: badQuery, caller, headers: badHeaders, type: contentType, body }).map(
        ({ id: segment, query, caller: who, headers, type, body: payload }): RouteCase => ({
          route: `${method} ${route.path}`,
          method,
          path: fill(segment),
          query,
          caller: who,
          headers: payload === undefined ? headers : { ...(type ? { "content-type": type } : {}), ...headers },
          body: payload,
        }),
      );
    return [
      ...route.reads.map((method) => make(method, idFor(true), fc.constant(undefined))),
      ...route.writesWithBody.map((method) => make(method, idFor(true), badJsonBody)),
      ...route.writesWithoutBody.map((method) => make(method, idFor(false), fc.option(badJsonBody, { nil: undefined }))),
    ];
  });
  return { routeCase: fc.oneof(...cases) };
}

function urlOf(world: RouteFuzzWorld, testCase: RouteCase): string {
  const search = testCase.query.map(([name, value]) => `${encodeURIComponent(name)}=${encodeURIComponent(value)}`).join("&");
  return `${world.appUrl}${testCase.path}${search ? `?${search}` : ""}`;
}

/** Sends one generated call as its caller (the admin's session cookie, the read key, or nothing). */
export async function sendRouteCase(world: RouteFuzzWorld, testCase: RouteCase): Promise<Response> {
  const url = urlOf(world, testCase);
  const init: RequestInit = { method: testCase.method, headers: { ...testCase.headers }, body: testCase.body as BodyInit | undefined };
  if (testCase.caller === "admin") {
    const relative = url.slice(world.appUrl.length);
    return world.northwind.admin.client.fetch(relative, init);
  }
  const headers = new Headers(init.headers);
  if (testCase.caller === "key") headers.set("authorization", `Bearer ${world.readKey}`);
  headers.set("origin", world.appUrl);
  return fetch(url, { ...init, headers, redirect: "manual" });
}

/** Sends a generated call and checks it: no 5xx, and every 4xx an RFC 9457 problem with a detail. @returns the status */
export async function checkRouteCase(world: RouteFuzzWorld, testCase: RouteCase): Promise<number> {
  return expectNoServerError(await sendRouteCase(world, testCase));
}

