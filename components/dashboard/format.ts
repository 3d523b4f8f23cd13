// Display formatting only: numbers arrive computed from lib/sequential through the API.

/** A share or relative lift as a signed percentage: +12.3 %. */
export function formatLiftPercent(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const text = `${(Math.abs(value) * 100).toFixed(digits)} %`;
  return value > 0 ? `+${text}` : value < 0 ? `−${text}` : text;
}

/** A rate or probability as a percentage: 4.92 %. */
export function formatPercent(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return `${(value * 100).toFixed(digits)} %`;
}

/** An interval of relative lifts; an open end is shown as ∞. */
export function formatInterval(interval: readonly (number | null)[] | null | undefined, digits = 1): string {
  if (!interval) return "—";
  const [low, high] = interval;
  const end = (value: number | null, open: string) => (value === null || !Number.isFinite(value) ? open : formatLiftPercent(value, digits));
  return `${end(low, "−∞")} to ${end(high, "+∞")}`;
}

/** An absolute difference of rates in percentage points: +0.42 pp. */
export function formatPoints(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const text = `${Math.abs(value * 100).toFixed(digits)} pp`;
  return value > 0 ? `+${text}` : value < 0 ? `−${text}` : text;
}

/** A p-value: 3 significant digits, "< 0.0001" below that. */
export function formatP(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  if (value < 0.0001) return "< 0.0001";
  return value >= 0.1 ? value.toFixed(2) : value.toPrecision(2);
}

/** A whole count with thousands separators. */
export function formatCount(value: number | null | undefined): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  return Math.round(value).toLocaleString("en-US");
}

/** A signed number with a unit: +0.42 USD. */
export function formatDifference(value: number | null | undefined, unit: string | null, digits = 2): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "—";
  const text = `${Math.abs(value).toFixed(digits)}${unit ? ` ${unit}` : ""}`;
  return value > 0 ? `+${text}` : value < 0 ? `−${text}` : text;
}

/** A timestamp as a short local date and time (the reader's clock). */
export function formatTimestamp(iso: string | null | undefined): string {
  if (!iso) return "never";
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? "—" : date.toLocaleString("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" });
}
