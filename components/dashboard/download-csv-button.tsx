"use client";

import { toCsv, csvFileName, type CsvCell } from "@/lib/csv-export";
import { buttonClasses } from "@/components/ui";

/** A button that downloads the given numbers as a CSV file (formula-like text cells are escaped). */
export function DownloadCsvButton({ label, fileParts, header, rows }: { label: string; fileParts: string[]; header: string[]; rows: CsvCell[][] }) {
  const download = () => {
    const blob = new Blob([toCsv(header, rows)], { type: "text/csv;charset=utf-8" });
    const url = URL.createObjectURL(blob);
    const link = document.createElement("a");
    link.href = url;
    link.download = csvFileName(...fileParts);
    document.body.append(link);
    link.click();
    link.remove();
    setTimeout(() => URL.revokeObjectURL(url), 1_000);
  };
  return (
    <button type="button" onClick={download} className={buttonClasses("secondary", "sm")}>
      {label}
    </button>
  );
}
