import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ingestBatchSchema, ingestBodySchema } from "@/lib/validation/ingest";

const outcome = (schema: typeof ingestBatchSchema | typeof ingestBodySchema, body: unknown) => {
  const result = schema.safeParse(body);
  return result.success ? { data: JSON.stringify(result.data) } : { issues: result.error.issues.map((issue) => [issue.path, issue.message]) };
};

const nearValid = <T>(valid: fc.Arbitrary<T>, ...wrong: unknown[]) => fc.oneof({ weight: 12, arbitrary: valid }, fc.constantFrom(...wrong));
const fields = {
  campaign: nearValid(fc.constantFrom("spring-sale", "0b7f6d5e-1c2a-4b3c-9d8e-7f6a5b4c3d2e"), " spring", "", "x".repeat(141), 7, null),
    arm: nearValid(fc.constantFrom("holdout", "treatment", "t-2"), "Holdout", "-a", "", 1),
    date: nearValid(fc.constantFrom("2026-02-28", "2024-02-29", "2026-11-30"), "2026-02-30", "2026-2-3", "2026-02-28T00:00:00Z", 20260228),
    units: nearValid(fc.integer({ min: 0, max: 2_147_483_647 }), -1, 1.5, 2_147_483_648, Number.NaN, "10", null),
    conversions: nearValid(fc.integer({ min: 0, max: 100 }), -3, 0.5, 2_147_483_648, "1"),
    sum: fc.double({ noNaN: true, min: 0, max: 100 }),
    sumSquares: fc.double({ noNaN: true, min: 0, max: 10_000 }),
    extra: fc.constant(true),
};
// Mostly the shape the plain path takes, mostly valid, so each of its checks meets a wrong value alone.
const conversionFields = { campaign: fields.campaign, arm: fields.arm, date: fields.date, units: fields.units, conversions: fields.conversions };
const row = fc.oneof({ weight: 3, arbitrary: fc.record(conversionFields) }, fc.record(fields, { requiredKeys: ["campaign", "arm", "date", "units"] }));
const body = fc.oneof(
  { weight: 6, arbitrary: fc.record({ rows: fc.array(fc.oneof({ weight: 8, arbitrary: row }, fc.constantFrom(null, 5, [], "row")), { maxLength: 3 }) }) },
  fc.constantFrom({}, { rows: "x" }, { rows: [], more: 1 }, null, []),
);

describe("ingestBatchSchema", () => {
  it("gives what ingestBodySchema gives: the same rows (key order included) or the same issue paths and messages", () => {
    fc.assert(fc.property(body, (value) => {
        expect(outcome(ingestBatchSchema, value)).toEqual(outcome(ingestBodySchema, value));
      }), { numRuns: 1_000 });
  }, 60_000);

  it("takes the plain path for a plain conversion row and keeps its fields in the schema's order", () => {
    const parsed = ingestBatchSchema.parse({ rows: [{ conversions: 5, units: 10, date: "2026-02-28", arm: "holdout", campaign: "spring-sale" }] });
    expect(JSON.stringify(parsed.rows[0])).toBe('{"campaign":"spring-sale","arm":"holdout","date":"2026-02-28","units":10,"conversions":5}');
  });
});
