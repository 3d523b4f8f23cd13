/** A cell of an exported table: text, a number (written as is; not finite is empty) or nothing. */
export type CsvCell = string | number | null | undefined;

/** Characters that make a spreadsheet read a text cell as a formula (OWASP "CSV injection"). */
const FORMULA_START = /^[=+\-@\t\r]/;

/**
 * One CSV cell: text that begins like a formula gets a leading apostrophe, and text with a comma,
 * quote or line break is quoted (RFC 4180). Numbers are written as numbers (a number is never a formula).
 */
export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  const text = FORMULA_START.test(value) ? `'${value}` : value;
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** A CSV document with a header line, lines ending in CRLF (RFC 4180). */
export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
  return [header, ...rows].map((row) => row.map(csvCell).join(",")).join("\r\n") + "\r\n";
}

/** A safe file name for a download: lower-case letters, digits and dashes, ending in `.csv`. */
export function csvFileName(...parts: string[]): string {
  const base = parts
    .join("-")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "-")
    .replace(/(^-|-$)/g, "");
  return `${base || "export"}.csv`;
}
