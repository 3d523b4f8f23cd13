"use client";

import { formatP } from "@/components/dashboard/format";
import type { StatusDay } from "@/lib/campaigns/campaign-status";
import { ChartFrame, LegendItem } from "./chart-frame";
import { PValuePlot } from "./lazy-plots";

/** The log axis cannot show 0; smaller p-values are drawn at this floor (the table keeps the value). */
const P_FLOOR = 1e-6;

/** The first day a daily peeker running the fixed-horizon test would have stopped (naive p below α), or null. */
export function firstNaiveStop(days: readonly StatusDay[], alpha: number): StatusDay | null {
  return days.find((day) => day.fixed.p !== null && day.fixed.p < alpha) ?? null;
}

/** Always-valid and naive p-values over time on one log axis, with the α line and the naive peeker's first stop. */
export function PValueChart({ campaignName, days, alpha }: { campaignName: string; days: StatusDay[]; alpha: number }) {
  const floor = (value: number | null) => (value === null || !Number.isFinite(value) ? null : Math.max(P_FLOOR, value));
  const data = days.map((day) => ({ date: day.date, sequential: floor(day.sequential.p), naive: floor(day.fixed.p) }));
  const stop = firstNaiveStop(days, alpha);
  return (
    <ChartFrame
      testId="p-value-chart"
      title="p-values over time"
      description={
        <>
          The always-valid p-value (solid) may be read every day; the naive p-value (dashed) is the fixed-horizon test re-run daily, which is only valid on the
          planned last day. Below the α line ({alpha}) a test calls it.
          {stop ? ` A daily peeker would have stopped on ${stop.date} (day ${stop.daysRun}).` : " A daily peeker would not have stopped yet."}
        </>
      }
      legend={
        <>
          <LegendItem kind="solid" colour="--treatment" label="Always-valid p" />
          <LegendItem kind="dashed" colour="--holdout" label="Naive p (daily peek)" />
          <LegendItem kind="dashed" colour="--alpha" label={`α = ${alpha}`} />
          {stop ? <LegendItem kind="dot" colour="--marker" label="A daily peeker stops here" /> : null}
        </>
      }
      fileParts={[campaignName, "p-values"]}
      table={{
        columns: [
          { label: "Day", csv: "date" },
          { label: "Always-valid p", csv: "always_valid_p", numeric: true },
          { label: "Naive p", csv: "naive_p", numeric: true },
        ],
        rows: days.map((day) => ({ shown: [day.date, formatP(day.sequential.p), formatP(day.fixed.p)], raw: [day.date, day.sequential.p, day.fixed.p] })),
      }}
    >
      <PValuePlot data={data} alpha={alpha} floor={P_FLOOR} stop={stop ? { date: stop.date, p: floor(stop.fixed.p) ?? P_FLOOR } : null} />
    </ChartFrame>
  );
}
