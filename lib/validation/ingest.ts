import { z } from "zod";
import { dayNumber } from "@/lib/sequential/day-number";
import { ARM_KEY_PATTERN, calendarDaySchema, campaignReferenceSchema } from "./campaigns";

/** At most this many rows in one batch. */
export const MAX_INGEST_ROWS = 5_000;
/** At most this many bytes in one ingest body (5,000 rows of about 150 bytes, with room to spare). */
export const MAX_INGEST_BYTES = 1_048_576;
/** Largest CSV upload accepted, in bytes (5,000 rows fit in well under this). */
export const MAX_CSV_BYTES = 1_048_576;

const count = (name: string) =>
  z
    .number({ error: `${name} must be a number` })
    .int(`${name} must be a whole number`)
    .min(0, `${name} must be ≥ 0`)
    .max(Number.MAX_SAFE_INTEGER, `${name} is too large`);

const finite = (name: string) => z.number({ error: `${name} must be a number` }).refine(Number.isFinite, `${name} must be finite`);

/**
 * One row of daily counts: that day's new counts for one arm. A conversion metric sends `conversions`,
 * a mean metric `sum` and `sumSquares`; which one the campaign needs is checked against the campaign.
 */
export const ingestRowSchema = z
  .object({
    campaign: campaignReferenceSchema,
    arm: z.string().regex(ARM_KEY_PATTERN, "arm must be an arm key (lower-case letters, digits, - or _)"),
    date: calendarDaySchema,
    units: count("units").max(2_147_483_647, "units is too large"),
    conversions: count("conversions").max(2_147_483_647, "conversions is too large").optional(),
    sum: finite("sum").optional(),
    sumSquares: finite("sumSquares").min(0, "sumSquares must be ≥ 0").optional(),
  })
  .strict()
  .superRefine((row, context) => {
    const hasConversions = row.conversions !== undefined;
    const hasMoments = row.sum !== undefined || row.sumSquares !== undefined;
    if (hasConversions && hasMoments) {
      context.addIssue({ code: "custom", path: ["conversions"], message: "Send conversions (conversion metric) or sum and sumSquares (mean metric), not both" });
    } else if (!hasConversions && !hasMoments) {
      context.addIssue({ code: "custom", path: ["conversions"], message: "Send conversions (conversion metric) or sum and sumSquares (mean metric)" });
    } else if (hasMoments && (row.sum === undefined || row.sumSquares === undefined)) {
      context.addIssue({ code: "custom", path: [row.sum === undefined ? "sum" : "sumSquares"], message: "A mean metric sends both sum and sumSquares" });
    } else if (hasMoments) {
      const sum = row.sum!;
      const sumSquares = row.sumSquares!;
      if (row.units === 0 && (sum !== 0 || sumSquares !== 0)) {
        context.addIssue({ code: "custom", path: ["sum"], message: "sum and sumSquares must be 0 when units is 0" });
      } else if (row.units > 0 && sumSquares < (sum * sum) / row.units - 1e-9 * Math.max(1, (sum * sum) / row.units)) {
        context.addIssue({ code: "custom", path: ["sumSquares"], message: "sumSquares must be at least sum²/units" });
      }
    }
  });
export type IngestRow = z.infer<typeof ingestRowSchema>;

export const ingestBodySchema = z
  .object({
    rows: z.array(ingestRowSchema).min(1, "Send at least one row").max(MAX_INGEST_ROWS, `At most ${MAX_INGEST_ROWS} rows in one batch`),
  })
  .strict();
export type IngestBody = z.infer<typeof ingestBodySchema>;

const DAY_PATTERN = /^\d{4}-\d{2}-\d{2}$/;
const isCount = (value: unknown): value is number => Number.isSafeInteger(value) && (value as number) >= 0 && (value as number) <= 2_147_483_647;

/**
 * A conversion row that `ingestRowSchema` accepts unchanged, built in the schema's key order (the
 * request hash depends on it); null for anything else, which then gets the full schema and its messages.
 */
function plainConversionRow(value: unknown): IngestRow | null {
  if (typeof value !== "object" || value === null || Array.isArray(value)) return null;
  const row = value as Record<string, unknown>;
  const keys = Object.keys(row);
  if (keys.length !== 5 || !keys.every((key) => key === "campaign" || key === "arm" || key === "date" || key === "units" || key === "conversions")) return null;
  const { campaign, arm, date, units, conversions } = row;
  if (typeof campaign !== "string" || campaign.length === 0 || campaign.length > 140 || campaign.trim() !== campaign) return null;
  if (typeof arm !== "string" || !ARM_KEY_PATTERN.test(arm)) return null;
  if (typeof date !== "string" || !DAY_PATTERN.test(date) || dayNumber(date) === null) return null;
  if (!isCount(units) || !isCount(conversions)) return null;
  return { campaign, arm, date, units, conversions };
}

const ingestRowInput = z.unknown().transform((value, context): IngestRow => {
  const plain = plainConversionRow(value);
  if (plain) return plain;
  const checked = ingestRowSchema.safeParse(value);
  if (checked.success) return checked.data;
  for (const issue of checked.error.issues) context.addIssue({ code: "custom", path: issue.path, message: issue.message });
  return z.NEVER;
});

/**
 * `ingestBodySchema` for parsing large batches (same output, same issue paths and messages): a plain
 * conversion row is checked without the per-row schema's machinery, which dominated 5,000-row batches.
 * The OpenAPI document keeps `ingestBodySchema`.
 */
export const ingestBatchSchema = z
  .object({
    rows: z.array(ingestRowInput).min(1, "Send at least one row").max(MAX_INGEST_ROWS, `At most ${MAX_INGEST_ROWS} rows in one batch`),
  })
  .strict();

/** The `Idempotency-Key` header: 1–255 visible ASCII characters. */
export const idempotencyKeySchema = z
  .string({ error: "Send an Idempotency-Key header" })
  .min(1, "Send an Idempotency-Key header")
  .max(255, "The Idempotency-Key is at most 255 characters")
  .regex(/^[\x21-\x7e]+$/, "The Idempotency-Key uses visible ASCII characters only");

/** The answer to an accepted batch. */
export const ingestResultSchema = z.object({
  batchId: z.string().uuid(),
  accepted: z.number().int().describe("Rows stored for an (arm, day) that had none"),
  replaced: z.number().int().describe("Rows that replaced different stored values (the old ones are kept as revisions)"),
  unchanged: z.number().int().describe("Rows identical to what was stored: nothing written"),
});
export type IngestResult = z.infer<typeof ingestResultSchema>;
