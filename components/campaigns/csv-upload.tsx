"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button, Card, CardHeader, Notice, Table, Td, Th } from "@/components/ui";
import type { CountsCsvResult } from "@/lib/counts-csv";

const PREVIEW_ROWS = 50;

type Outcome = { kind: "stored"; accepted: number; replaced: number; unchanged: number } | { kind: "refused"; detail: string; errors: { row?: number; message: string }[] };

/** Sends the file with upload progress (fetch has none). */
function send(url: string, text: string, onProgress: (fraction: number) => void): Promise<{ status: number; body: Record<string, unknown> }> {
  return new Promise((resolve, reject) => {
    const request = new XMLHttpRequest();
    request.open("POST", url);
    request.setRequestHeader("content-type", "text/csv");
    request.upload.onprogress = (event) => event.lengthComputable && onProgress(event.loaded / event.total);
    request.onload = () => {
      let body: Record<string, unknown> = {};
      try {
        body = JSON.parse(request.responseText);
      } catch {
        body = { detail: "The server's answer was not readable." };
      }
      resolve({ status: request.status, body });
    };
    request.onerror = () => reject(new Error("The upload did not reach the server."));
    request.send(text);
  });
}

function Progress({ label, fraction }: { label: string; fraction: number }) {
  const percent = Math.round(fraction * 100);
  return (
    <div className="space-y-1">
      <p className="text-sm">
        {label}: {percent} %
      </p>
      <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={percent} className="h-2 w-full rounded bg-slate-200 dark:bg-slate-700">
        <div className="h-2 rounded bg-pine-600" style={{ width: `${percent}%` }} />
      </div>
    </div>
  );
}

/**
 * CSV upload of daily counts: reads and parses the file in the browser (the same parser as the server
 * and the CLI), previews it with every bad line, and writes nothing until confirmed.
 */
/** The upload limits come from the server (lib/validation/ingest), so the browser bundle carries no validation code. */
export function CsvUpload({ campaignId, metric, limits }: { campaignId: string; metric: "conversion" | "mean"; limits: { maxBytes: number; maxRows: number } }) {
  const { maxBytes: MAX_CSV_BYTES, maxRows: MAX_INGEST_ROWS } = limits;
  const router = useRouter();
  const [file, setFile] = useState<{ name: string; text: string } | null>(null);
  const [parsed, setParsed] = useState<CountsCsvResult | null>(null);
  const [tooLarge, setTooLarge] = useState<string | null>(null);
  const [reading, setReading] = useState<number | null>(null);
  const [uploading, setUploading] = useState<number | null>(null);
  const [outcome, setOutcome] = useState<Outcome | null>(null);
  const header = metric === "conversion" ? "date,arm,units,conversions" : "date,arm,units,sum,sum_squares";

  function choose(chosen: File | undefined) {
    setFile(null);
    setParsed(null);
    setOutcome(null);
    setTooLarge(null);
    if (!chosen) return;
    if (chosen.size > MAX_CSV_BYTES) {
      setTooLarge(`"${chosen.name}" is ${(chosen.size / 1_048_576).toFixed(1)} MB; the limit is ${MAX_CSV_BYTES / 1_048_576} MB (about ${MAX_INGEST_ROWS.toLocaleString("en-US")} rows). Split it into smaller files.`);
      return;
    }
    // The CSV parser loads only once a file is chosen, while the file is read.
    const parser = import("@/lib/counts-csv");
    const reader = new FileReader();
    reader.onprogress = (event) => event.lengthComputable && setReading(event.loaded / event.total);
    reader.onload = async () => {
      const text = String(reader.result ?? "");
      const { parseCountsCsv } = await parser.catch(() => ({ parseCountsCsv: null }));
      setReading(null);
      if (!parseCountsCsv) {
        setTooLarge("The CSV reader could not be loaded; reload the page and try again.");
        return;
      }
      const result = parseCountsCsv(text);
      if (result.rows.length > MAX_INGEST_ROWS) setTooLarge(`The file has ${result.rows.length.toLocaleString("en-US")} rows; at most ${MAX_INGEST_ROWS.toLocaleString("en-US")} go in one upload.`);
      setFile({ name: chosen.name, text });
      setParsed(result);
    };
    reader.onerror = () => {
      setReading(null);
      setTooLarge("The file could not be read.");
    };
    setReading(0);
    reader.readAsText(chosen);
  }

  async function confirm() {
    if (!file) return;
    setUploading(0);
    try {
      const { status, body } = await send(`/api/v1/campaigns/${campaignId}/counts`, file.text, setUploading);
      if (status === 200) {
        setOutcome({ kind: "stored", accepted: Number(body.accepted), replaced: Number(body.replaced), unchanged: Number(body.unchanged) });
        setFile(null);
        setParsed(null);
        router.refresh();
      } else {
        setOutcome({ kind: "refused", detail: String(body.detail ?? "The upload was refused."), errors: (body.errors as { row?: number; message: string }[]) ?? [] });
      }
    } catch (error) {
      setOutcome({ kind: "refused", detail: error instanceof Error ? error.message : "The upload failed.", errors: [] });
    } finally {
      setUploading(null);
    }
  }

  const metricMismatch = parsed?.metric && parsed.metric !== metric;
  const canConfirm = parsed !== null && parsed.errors.length === 0 && parsed.rows.length > 0 && !metricMismatch && !tooLarge && uploading === null;

  return (
    <Card aria-labelledby="csv-upload-title">
      <CardHeader id="csv-upload-title" title="Upload daily counts (CSV)" description={<>Columns: <code>{header}</code>, one row per day and arm with that day&apos;s new counts. Nothing is stored until you confirm.</>} />
      <label htmlFor="csv-file" className="block text-sm font-medium">
        CSV file
      </label>
      <input id="csv-file" type="file" accept=".csv,text/csv" className="mt-1 block text-sm" onChange={(event) => choose(event.target.files?.[0])} />
      <div className="mt-4 space-y-4">
        {reading !== null ? <Progress label="Reading the file" fraction={reading} /> : null}
        {uploading !== null ? <Progress label="Uploading" fraction={uploading} /> : null}
        {tooLarge ? <Notice tone="error" title="File too large">{tooLarge}</Notice> : null}
        {metricMismatch ? <Notice tone="error" title="Wrong columns for this campaign">This campaign expects the header <code>{header}</code>.</Notice> : null}
        {parsed && parsed.errors.length > 0 ? (
          <Notice tone="error" title={`${parsed.errors.length} ${parsed.errors.length === 1 ? "line has" : "lines have"} a problem; fix the file and choose it again`}>
            <ul className="list-disc space-y-0.5 pl-5" data-testid="csv-errors">
              {parsed.errors.map((error) => (
                <li key={`${error.line}-${error.reason}`}>
                  Line {error.line}: {error.reason}
                </li>
              ))}
            </ul>
          </Notice>
        ) : null}
        {parsed && parsed.rows.length > 0 ? (
          <div data-testid="csv-preview">
            <p className="mb-2 text-sm">
              {parsed.rows.length.toLocaleString("en-US")} good {parsed.rows.length === 1 ? "row" : "rows"} in {file?.name}
              {parsed.rows.length > PREVIEW_ROWS ? `; the first ${PREVIEW_ROWS} are shown` : ""}.
            </p>
            <Table caption="Preview of the CSV rows">
              <thead>
                <tr>
                  <Th numeric>Line</Th>
                  <Th>Date</Th>
                  <Th>Arm</Th>
                  <Th numeric>Units</Th>
                  <Th numeric>{metric === "conversion" ? "Conversions" : "Sum"}</Th>
                  {metric === "mean" ? <Th numeric>Sum of squares</Th> : null}
                </tr>
              </thead>
              <tbody>
                {parsed.rows.slice(0, PREVIEW_ROWS).map((row) => (
                  <tr key={row.line}>
                    <Td numeric>{row.line}</Td>
                    <Td>{row.date}</Td>
                    <Td>{row.arm}</Td>
                    <Td numeric>{row.n.toLocaleString("en-US")}</Td>
                    <Td numeric>{row.sum.toLocaleString("en-US")}</Td>
                    {metric === "mean" ? <Td numeric>{row.sumSq.toLocaleString("en-US")}</Td> : null}
                  </tr>
                ))}
              </tbody>
            </Table>
          </div>
        ) : null}
        {parsed ? (
          <Button onClick={confirm} disabled={!canConfirm} pending={uploading !== null}>
            Store {parsed.rows.length.toLocaleString("en-US")} rows
          </Button>
        ) : null}
        {outcome?.kind === "stored" ? (
          <Notice tone="success" title="Counts stored">
            {outcome.accepted} new, {outcome.replaced} replaced (the old values are kept), {outcome.unchanged} unchanged.
          </Notice>
        ) : null}
        {outcome?.kind === "refused" ? (
          <Notice tone="error" title="Nothing was stored">
            <p>{outcome.detail}</p>
            <ul className="list-disc pl-5" data-testid="csv-server-errors">
              {outcome.errors.map((error, index) => (
                <li key={index}>
                  {error.row !== undefined ? `Line ${error.row}: ` : ""}
                  {error.message}
                </li>
              ))}
            </ul>
          </Notice>
        ) : null}
      </div>
    </Card>
  );
}
