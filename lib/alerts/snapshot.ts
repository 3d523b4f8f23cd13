import type { CallName } from "@/db/schema";

/** The numbers of the day a call changed, frozen into the alert so every message tells the same story. */
export interface AlertSnapshot {
  campaignName: string;
  metricKind: "conversion" | "mean";
  metricName: string;
  metricUnit: string | null;
  call: CallName;
  fromCall: CallName;
  day: string;
  daysRun: number;
  maxDays: number;
  leadingArm: string | null;
  leadingArmName: string | null;
  liftAbsolute: number | null;
  liftRelative: number | null;
  /** Always-valid confidence sequence of the absolute lift; null ends are open. */
  sequence: [number | null, number | null] | null;
  relativeSequence: [number | null, number | null] | null;
  /** The fixed-horizon interval and p-value (the naive peek before the horizon). */
  fixedInterval: [number | null, number | null] | null;
  fixedP: number | null;
  sequentialP: number | null;
  significanceLevel: number;
  minimumLift: number;
  healthIssues: string[];
}

/** A JSON-safe number: ±Infinity and NaN become null (an open interval end). */
export function finiteOrNull(value: number | null | undefined): number | null {
  return typeof value === "number" && Number.isFinite(value) ? value : null;
}

export function intervalOrNull(interval: readonly [number, number] | null | undefined): [number | null, number | null] | null {
  return interval ? [finiteOrNull(interval[0]), finiteOrNull(interval[1])] : null;
}
