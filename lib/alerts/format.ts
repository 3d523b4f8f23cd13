import type { AlertSnapshot } from "./snapshot";

/** A p-value as people read it: four decimals, or "< 0.0001". */
export function formatPValue(p: number | null): string {
  if (p === null) return "not estimable yet";
  if (p < 0.0001) return "< 0.0001";
  return p.toFixed(4);
}

/** An absolute lift: percentage points for a conversion metric, the metric's unit for a mean metric. */
export function formatAbsolute(value: number | null, snapshot: Pick<AlertSnapshot, "metricKind" | "metricUnit">): string {
  if (value === null) return "open";
  if (snapshot.metricKind === "conversion") return `${signed(value * 100, 2)} pp`;
  return `${signed(value, 2)}${snapshot.metricUnit ? ` ${snapshot.metricUnit}` : ""}`;
}

/** A relative lift in per cent. */
export function formatRelative(value: number | null): string {
  return value === null ? "open" : `${signed(value * 100, 1)} %`;
}

/** An interval `[low, high]` with both ends formatted; open ends say so. */
export function formatInterval(interval: [number | null, number | null] | null, format: (value: number | null) => string): string {
  if (!interval) return "not estimable yet";
  return `${format(interval[0])} to ${format(interval[1])}`;
}

function signed(value: number, digits: number): string {
  const text = Math.abs(value).toFixed(digits);
  if (Number(text) === 0) return (0).toFixed(digits);
  return `${value < 0 ? "−" : "+"}${text}`;
}
