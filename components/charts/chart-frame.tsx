"use client";

import { DataTable } from "@/components/dashboard/data-table";
import { useId, useState, type ReactNode } from "react";
import { DownloadCsvButton } from "@/components/dashboard/download-csv-button";
import { Button, Card, Td, Th } from "@/components/ui";
import type { CsvCell } from "@/lib/csv-export";

export interface ChartTable {
  /** Column headings as shown; `csv` names the CSV columns (machine-friendly). */
  columns: { label: string; csv: string; numeric?: boolean }[];
  /** Shown cells (formatted) and the raw numbers for the CSV, row by row. */
  rows: { shown: ReactNode[]; raw: CsvCell[] }[];
}

/** Series colours for light and dark mode; holdout slate and treatment pine on every chart. */
export const CHART_COLOURS =
  "[--treatment:#2f6553] [--treatment-2:#5e9a82] [--holdout:#64748b] [--band:#b9d6c8] [--outline:#334155] [--grid:#cbd5e1] [--axis:#475569] [--alpha:#b45309] [--marker:#b91c1c] " +
  "dark:[--treatment:#8cbaa6] dark:[--treatment-2:#b9d6c8] dark:[--holdout:#94a3b8] dark:[--band:#285244] dark:[--outline:#e2e8f0] dark:[--grid:#334155] dark:[--axis:#cbd5e1] dark:[--alpha:#fbbf24] dark:[--marker:#f87171]";

/**
 * A chart card with its words: a title, what it shows, a legend in words, the chart or its table
 * (a toggle) and a CSV download of the same numbers.
 */
export function ChartFrame({
  title,
  description,
  legend,
  table,
  fileParts,
  children,
  testId,
}: {
  title: string;
  description: ReactNode;
  legend?: ReactNode;
  table: ChartTable;
  fileParts: string[];
  children: ReactNode;
  testId?: string;
}) {
  const [showTable, setShowTable] = useState(false);
  const headingId = useId();
  return (
    <Card aria-labelledby={headingId} className={CHART_COLOURS}>
      <div className="mb-3 flex flex-wrap items-start justify-between gap-3">
        <div className="min-w-0 max-w-3xl">
          <h2 id={headingId} className="text-base font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">
            {title}
          </h2>
          <p className="mt-1 text-sm text-tremor-content dark:text-dark-tremor-content">{description}</p>
        </div>
        <div className="flex shrink-0 gap-2">
          <Button variant="secondary" size="sm" aria-pressed={showTable} onClick={() => setShowTable((value) => !value)}>
            {showTable ? "Show chart" : "Show table"}
          </Button>
          <DownloadCsvButton label="Download CSV" fileParts={fileParts} header={table.columns.map((column) => column.csv)} rows={table.rows.map((row) => row.raw)} />
        </div>
      </div>
      {legend ? <div className="mb-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-tremor-content-emphasis dark:text-dark-tremor-content-emphasis">{legend}</div> : null}
      {showTable ? (
        <DataTable caption={`${title}: the numbers`}>
          <thead>
            <tr>
              {table.columns.map((column) => (
                <Th key={column.csv} numeric={column.numeric}>
                  {column.label}
                </Th>
              ))}
            </tr>
          </thead>
          <tbody>
            {table.rows.map((row, index) => (
              <tr key={index}>
                {row.shown.map((cell, cellIndex) => (
                  <Td key={cellIndex} numeric={table.columns[cellIndex]?.numeric}>
                    {cell}
                  </Td>
                ))}
              </tr>
            ))}
          </tbody>
        </DataTable>
      ) : (
        <div data-testid={testId} className="h-64 w-full sm:h-72">
          {children}
        </div>
      )}
    </Card>
  );
}

/** One legend entry: a drawn sample of the line or fill, and its words. */
export function LegendItem({ kind, colour, label }: { kind: "solid" | "dashed" | "fill" | "outline" | "dot"; colour: string; label: string }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      <svg width="22" height="10" aria-hidden="true">
        {kind === "fill" ? <rect x="1" y="1" width="20" height="8" style={{ fill: `var(${colour})`, opacity: 0.7 }} /> : null}
        {kind === "outline" ? <rect x="1" y="1" width="20" height="8" fill="none" style={{ stroke: `var(${colour})` }} strokeDasharray="3 2" /> : null}
        {kind === "solid" || kind === "dashed" ? <line x1="1" x2="21" y1="5" y2="5" style={{ stroke: `var(${colour})` }} strokeWidth="2" strokeDasharray={kind === "dashed" ? "4 3" : undefined} /> : null}
        {kind === "dot" ? <circle cx="11" cy="5" r="4" style={{ fill: `var(${colour})` }} /> : null}
      </svg>
      {label}
    </span>
  );
}
