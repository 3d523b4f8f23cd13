import { createHash } from "node:crypto";
import type { CampaignDto } from "@/db/queries/campaigns";
import { parseCountsCsv } from "@/lib/counts-csv";
import { PayloadTooLargeError, ValidationError, type FieldProblem } from "@/lib/errors";
import { ingestBatchSchema, MAX_CSV_BYTES, MAX_INGEST_ROWS, type IngestRow } from "@/lib/validation/ingest";
import { ingestBatch, type IngestOutcome } from "./ingest-batch";

export { MAX_CSV_BYTES };

/**
 * The CSV upload's confirm step: parses the file with the same parser the browser previewed with,
 * turns it into ingest rows for the campaign and sends it down the ingest path (source `csv`), all or
 * nothing. The idempotency key is the file's hash, so confirming twice stores once. Problems name
 * the CSV line (`row` is the line number, the header being line 1).
 */
export async function ingestCsv(options: { workspaceId: string; userId: string; campaign: CampaignDto; text: string }): Promise<IngestOutcome> {
  const { campaign, text } = options;
  if (Buffer.byteLength(text, "utf8") > MAX_CSV_BYTES) throw new PayloadTooLargeError(`The file is larger than ${MAX_CSV_BYTES / 1_048_576} MB; split it into smaller files.`);
  const parsed = parseCountsCsv(text);
  const lineProblems: FieldProblem[] = parsed.errors.map((error) => ({ row: error.line, pointer: `/lines/${error.line}`, message: error.reason }));
  if (parsed.metric !== null && parsed.metric !== campaign.metric.kind) {
    lineProblems.unshift({
      row: 1,
      pointer: "/lines/1",
      message: campaign.metric.kind === "conversion" ? "This campaign measures conversions: the header is date,arm,units,conversions" : "This campaign measures a mean: the header is date,arm,units,sum,sum_squares",
    });
  }
  if (lineProblems.length > 0) throw new ValidationError(`${lineProblems.length} ${lineProblems.length === 1 ? "line has a problem" : "lines have problems"}; nothing was stored.`, lineProblems);
  if (parsed.rows.length > MAX_INGEST_ROWS) throw new PayloadTooLargeError(`The file has ${parsed.rows.length} rows; at most ${MAX_INGEST_ROWS} go in one upload.`);
  if (parsed.rows.length === 0) throw new ValidationError("The file has no rows.", [{ row: 2, pointer: "/lines/2", message: "Add at least one row under the header" }]);

  const rows: IngestRow[] = parsed.rows.map((row) =>
    campaign.metric.kind === "conversion"
      ? { campaign: campaign.id, arm: row.arm, date: row.date, units: row.n, conversions: row.sum }
      : { campaign: campaign.id, arm: row.arm, date: row.date, units: row.n, sum: row.sum, sumSquares: row.sumSq },
  );
  const lineOf = (index: number | undefined) => (index === undefined ? undefined : parsed.rows[index]?.line);
  const checked = ingestBatchSchema.safeParse({ rows });
  if (!checked.success) {
    throw new ValidationError(
      "Some lines have problems; nothing was stored.",
      checked.error.issues.map((issue) => {
        const line = typeof issue.path[1] === "number" ? lineOf(issue.path[1]) : undefined;
        return { ...(line !== undefined ? { row: line } : {}), pointer: line !== undefined ? `/lines/${line}` : "", message: issue.message };
      }),
    );
  }
  const hash = createHash("sha256").update(text).digest("hex");
  try {
    return await ingestBatch({ workspaceId: options.workspaceId, userId: options.userId, source: "csv", idempotencyKey: `csv:${campaign.id}:${hash}`, rows: checked.data.rows });
  } catch (error) {
    if (error instanceof ValidationError) {
      throw new ValidationError(
        error.message,
        error.errors.map((problem) => {
          const line = lineOf(problem.row);
          return { ...(line !== undefined ? { row: line } : {}), pointer: line !== undefined ? `/lines/${line}` : problem.pointer, message: problem.message };
        }),
      );
    }
    throw error;
  }
}
