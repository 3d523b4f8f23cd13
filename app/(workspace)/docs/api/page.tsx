import type { Metadata } from "next";
import Link from "next/link";
import { Card, CardHeader, Table, Td, Th } from "@/components/ui";
import { requireWorkspace } from "@/lib/auth/session";
import { getEnv } from "@/lib/env";
import { MAX_INGEST_BYTES, MAX_INGEST_ROWS } from "@/lib/validation/ingest";

export const metadata: Metadata = { title: "API · Peeksafe" };

function Code({ children }: { children: string }) {
  return (
    <pre tabIndex={0} className="overflow-x-auto rounded-tremor-default bg-slate-900 p-4 text-xs leading-relaxed text-slate-100">
      <code>{children}</code>
    </pre>
  );
}

const ROUTES: [string, string, string][] = [
  ["POST", "/api/v1/ingest", "Push daily counts (pipeline key with the ingest permission)"],
  ["GET", "/api/v1/campaigns", "The workspace's campaigns; ?status=running filters"],
  ["POST", "/api/v1/campaigns", "Register a campaign (marketer or admin)"],
  ["GET", "/api/v1/campaigns/:id", "One campaign by id or slug"],
  ["PATCH", "/api/v1/campaigns/:id", "Lifecycle move ({\"status\":\"running\"}), edits, or a plan change"],
  ["GET", "/api/v1/campaigns/:id/status", "Latest call, lift with its intervals, p-values, data health"],
  ["GET", "/api/v1/campaigns/:id/series", "The same fields, one entry per day"],
  ["GET", "/api/v1/openapi.json", "This API as an OpenAPI 3.1 document"],
];

export default async function ApiDocsPage() {
  await requireWorkspace();
  const base = getEnv().APP_URL;
  const curl = `curl -sS -X POST ${base}/api/v1/ingest \\
  -H "Authorization: Bearer $PEEKSAFE_KEY" \\
  -H "Content-Type: application/json" \\
  -H "Idempotency-Key: nightly-2026-03-02" \\
  -d '{"rows":[
    {"campaign":"trail-shoe-spring-e-mail","arm":"holdout","date":"2026-03-01","units":1204,"conversions":61},
    {"campaign":"trail-shoe-spring-e-mail","arm":"treatment","date":"2026-03-01","units":10877,"conversions":612}
  ]}'`;
  const answer = `{"batchId":"5b0e…","accepted":2,"replaced":0,"unchanged":0}`;
  const problem = `HTTP/1.1 422 Unprocessable Content
Content-Type: application/problem+json

{"type":"https://peeksafe.local/problems/invalid-input","title":"Invalid input","status":422,
 "detail":"1 row was refused; nothing from this batch was stored.",
 "errors":[{"row":1,"pointer":"/rows/1/arm","message":"Campaign \\"trail-shoe-spring-e-mail\\" has no arm \\"treatmnet\\""}]}`;
  return (
    <div className="max-w-4xl space-y-6">
      <div>
        <h1 className="text-xl font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">API for the data pipeline</h1>
        <p className="mt-1 text-sm text-tremor-content">
          JSON over HTTPS under <code>/api/v1</code>. Create a key with the <em>ingest</em> permission in <Link href="/settings" className="underline">Settings</Link>; the machine-readable description is{" "}
          <a href="/api/v1/openapi.json" className="underline">
            openapi.json
          </a>
          .
        </p>
      </div>
      <Card>
        <CardHeader title="Push yesterday's counts" description="Each row is that day's new units and conversions for one arm (a mean metric sends units, sum and sumSquares)." />
        <Code>{curl}</Code>
        <p className="mt-3 text-sm">The answer:</p>
        <Code>{answer}</Code>
        <ul className="mt-4 list-disc space-y-1 pl-5 text-sm">
          <li>All or nothing: at most {MAX_INGEST_ROWS.toLocaleString("en-US")} rows and {(MAX_INGEST_BYTES / 1_048_576).toFixed(0)} MiB per batch (413 past it).</li>
          <li>Resending a day replaces it; the old values are kept as a revision. An identical row changes nothing.</li>
          <li>The same Idempotency-Key returns the first answer without writing again; the same key with another body is a 409.</li>
          <li>Counts are whole numbers ≥ 0; cumulative conversions never exceed cumulative units; days are real, not before the start and not in the future of the workspace&apos;s time zone.</li>
          <li>Rate limit per key: see the RateLimit and RateLimit-Policy headers; a 429 carries Retry-After.</li>
        </ul>
      </Card>
      <Card>
        <CardHeader title="When a batch is refused" description="RFC 9457 problem details; every bad row is named by its index in rows." />
        <Code>{problem}</Code>
      </Card>
      <Card>
        <CardHeader title="Routes" />
        <Table caption="Routes of the API">
          <thead>
            <tr>
              <Th>Method</Th>
              <Th>Path</Th>
              <Th>What it does</Th>
            </tr>
          </thead>
          <tbody>
            {ROUTES.map(([method, path, what]) => (
              <tr key={`${method} ${path}`}>
                <Td>
                  <code>{method}</code>
                </Td>
                <Td>
                  <code>{path}</code>
                </Td>
                <Td>{what}</Td>
              </tr>
            ))}
          </tbody>
        </Table>
      </Card>
    </div>
  );
}
