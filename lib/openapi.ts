import { z } from "zod";
import { CALLS, CAMPAIGN_STATUSES } from "@/db/schema/campaigns";
import { createCampaignSchema, updateCampaignSchema } from "@/lib/validation/campaigns";
import { ingestBodySchema, ingestResultSchema, MAX_INGEST_BYTES, MAX_INGEST_ROWS } from "@/lib/validation/ingest";

const interval = z.tuple([z.number().nullable(), z.number().nullable()]).nullable().describe("[lower, upper]; null for an open (one-sided) end");

const campaignSchema = z.object({
  id: z.string().uuid(),
  slug: z.string(),
  name: z.string(),
  hypothesis: z.string(),
  metric: z.object({ kind: z.enum(["conversion", "mean"]), name: z.string(), unit: z.string().nullable() }),
  baselineRate: z.number().nullable(),
  baselineMean: z.number().nullable(),
  baselineSd: z.number().nullable(),
  minimumLift: z.number(),
  alpha: z.number(),
  power: z.number(),
  sides: z.union([z.literal(1), z.literal(2)]),
  arms: z.array(z.object({ id: z.string().uuid(), key: z.string(), name: z.string(), share: z.number(), isHoldout: z.boolean() })),
  startDate: z.string(),
  maxDays: z.number().int(),
  dailyUnits: z.number().int().nullable(),
  tau: z.number().describe("Mixing standard deviation of the mSPRT, fixed from the plan"),
  plan: z.object({ perArm: z.record(z.string(), z.number().int()), total: z.number().int(), days: z.number().int().nullable() }),
  status: z.enum(CAMPAIGN_STATUSES),
  planChangedAt: z.string().nullable().describe("Set when an admin changed the plan after counts arrived"),
  createdAt: z.string(),
  updatedAt: z.string(),
});

const statusDay = {
  call: z.enum(CALLS),
  daysRun: z.number().int(),
  lift: z.object({ absolute: z.number().nullable(), relative: z.number().nullable(), cs: interval, ci: interval }),
  sequential: z.object({ p: z.number().nullable().describe("Always-valid mSPRT p-value") }),
  fixed: z.object({ p: z.number().nullable().describe("Fixed-horizon z-test p-value (a naive peek before the horizon)"), horizonReached: z.boolean() }),
  health: z.object({ srmP: z.number().nullable(), issues: z.array(z.object({ rule: z.string(), date: z.string().nullable(), arm: z.string(), message: z.string() })) }),
};

const freshness = {
  analyzedAt: z.string().nullable().describe("When the worker last analysed the campaign; null before the first analysis"),
  stale: z.boolean().describe("Counts or the plan changed after the last analysis: the next worker pass refreshes the numbers"),
};

const statusSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  status: z.enum(CAMPAIGN_STATUSES),
  asOf: z.string().nullable(),
  ...statusDay,
  planChangedAt: z.string().nullable(),
  updatedAt: z.string(),
  ...freshness,
});

const seriesSchema = z.object({ id: z.string().uuid(), name: z.string(), days: z.array(z.object({ date: z.string(), ...statusDay })), ...freshness });

const problemSchema = z.object({
  type: z.string(),
  title: z.string(),
  status: z.number().int(),
  detail: z.string(),
  instance: z.string().optional(),
  errors: z.array(z.object({ row: z.number().int().optional().describe("Index of the row in `rows` (CSV upload: the line number)"), pointer: z.string(), message: z.string() })).optional(),
});

function schema(value: z.ZodType, io: "input" | "output" = "output") {
  const { $schema: _dialect, ...rest } = z.toJSONSchema(value, { target: "draft-2020-12", io, unrepresentable: "any" }) as Record<string, unknown>;
  void _dialect;
  return rest;
}

const ref = (name: string) => ({ $ref: `#/components/schemas/${name}` });
const json = (name: string) => ({ content: { "application/json": { schema: ref(name) } } });
const problem = (description: string) => ({ description, content: { "application/problem+json": { schema: ref("Problem") } } });
const idParameter = { name: "id", in: "path", required: true, description: "The campaign's id or slug", schema: { type: "string" } };
const readErrors = { "401": problem("Not signed in, or no valid key"), "403": problem("The role or key does not allow this"), "404": problem("No such campaign in this workspace") };

/** The OpenAPI 3.1 document of the public API, built from the zod schemas the handlers parse with (zod's own `z.toJSONSchema`). */
export function openApiDocument(serverUrl: string) {
  return {
    openapi: "3.1.0",
    jsonSchemaDialect: "https://json-schema.org/draft/2020-12/schema",
    info: {
      title: "Peeksafe API",
      version: "1.0.0",
      description: "Campaign lift against a randomized holdout, with always-valid sequential statistics. Errors are RFC 9457 problem details.",
    },
    servers: [{ url: serverUrl }],
    security: [{ apiKey: [] }, { session: [] }],
    paths: {
      "/api/v1/campaigns": {
        get: {
          summary: "List the workspace's campaigns",
          parameters: [{ name: "status", in: "query", required: false, schema: { type: "string", enum: [...CAMPAIGN_STATUSES] } }],
          responses: { "200": { description: "The campaigns, newest first", content: { "application/json": { schema: { type: "object", properties: { campaigns: { type: "array", items: ref("Campaign") } } } } } }, ...readErrors },
        },
        post: {
          summary: "Register a campaign (marketer or admin)",
          requestBody: { required: true, ...json("CreateCampaign") },
          responses: { "201": { description: "The stored campaign with its id, slug, τ and fixed-horizon plan", ...json("Campaign") }, "422": problem("The plan is invalid"), ...readErrors },
        },
      },
      "/api/v1/campaigns/{id}": {
        parameters: [idParameter],
        get: { summary: "One campaign", responses: { "200": { description: "The campaign", ...json("Campaign") }, ...readErrors } },
        patch: {
          summary: "Move a campaign through its lifecycle, edit it, or change its plan",
          description: "draft → running ⇄ paused → ended → archived. Once counts exist the plan is locked: only an admin may change it, with a `reason`.",
          requestBody: { required: true, ...json("UpdateCampaign") },
          responses: { "200": { description: "The updated campaign", ...json("Campaign") }, "409": problem("A move the lifecycle forbids, or a locked plan"), "422": problem("Invalid input"), ...readErrors },
        },
      },
      "/api/v1/campaigns/{id}/status": {
        parameters: [idParameter],
        get: { summary: "The latest call and statistics, as the worker last stored them", responses: { "200": { description: "Status", ...json("CampaignStatus") }, ...readErrors } },
      },
      "/api/v1/campaigns/{id}/series": {
        parameters: [idParameter],
        get: { summary: "One entry per day", responses: { "200": { description: "Series", ...json("CampaignSeries") }, ...readErrors } },
      },
      "/api/v1/ingest": {
        post: {
          summary: "Push daily counts (pipeline key with the ingest permission)",
          description: `All or nothing, at most ${MAX_INGEST_ROWS} rows and ${MAX_INGEST_BYTES} bytes. Each row is that day's new counts for one arm; a row for a stored (arm, day) replaces it and keeps the old values as a revision; an identical row changes nothing.`,
          security: [{ apiKey: [] }],
          parameters: [{ name: "Idempotency-Key", in: "header", required: true, description: "A replay returns the first answer; the same key with another body is a 409", schema: { type: "string", maxLength: 255 } }],
          requestBody: { required: true, ...json("IngestBody") },
          responses: {
            "200": { description: "Stored", ...json("IngestResult"), headers: { RateLimit: { schema: { type: "string" } }, "RateLimit-Policy": { schema: { type: "string" } } } },
            "400": problem("Malformed JSON"),
            "401": problem("Missing, unknown or revoked key"),
            "403": problem("The key lacks the ingest permission"),
            "409": problem("The Idempotency-Key was used for another body"),
            "413": problem("The body is too large"),
            "422": problem("Bad rows; `errors` names every one"),
            "429": { description: "Too many requests from this key; see Retry-After", headers: { "Retry-After": { schema: { type: "integer" } } } },
            "503": {
              description: "Busy (too many batches in flight) or the database is unreachable; nothing was stored: retry after Retry-After with the same Idempotency-Key",
              headers: { "Retry-After": { schema: { type: "integer" } } },
            },
          },
        },
      },
    },
    components: {
      securitySchemes: {
        apiKey: { type: "http", scheme: "bearer", description: "A workspace API key (psk_…)" },
        session: { type: "apiKey", in: "cookie", name: "better-auth.session_token" },
      },
      schemas: {
        CreateCampaign: schema(createCampaignSchema, "input"),
        UpdateCampaign: schema(updateCampaignSchema, "input"),
        IngestBody: schema(ingestBodySchema, "input"),
        IngestResult: schema(ingestResultSchema),
        Campaign: schema(campaignSchema),
        CampaignStatus: schema(statusSchema),
        CampaignSeries: schema(seriesSchema),
        Problem: schema(problemSchema),
      },
    },
  };
}
