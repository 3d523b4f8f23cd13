"use client";

import { CartesianGrid, ComposedChart, Line, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatP } from "@/components/dashboard/format";
import type { StatusDay } from "@/lib/campaigns/campaign-status";
import { ChartFrame, LegendItem } from "./chart-frame";

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
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 4, left: 4 }} accessibilityLayer={false}>
          <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
          <XAxis dataKey="date" tick={{ fill: "var(--axis)", fontSize: 12 }} stroke="var(--grid)" minTickGap={24} />
          <YAxis
            scale="log"
            domain={[P_FLOOR, 1]}
            allowDataOverflow
            ticks={[1e-6, 1e-4, 0.01, 0.05, 1]}
            tickFormatter={(value: number) => (value >= 0.01 ? String(value) : value.toExponential(0))}
            tick={{ fill: "var(--axis)", fontSize: 12 }}
            stroke="var(--grid)"
            width={52}
          />
          <Tooltip formatter={(value, name) => [formatP(value as number), String(name)]} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
          <ReferenceLine y={alpha} stroke="var(--alpha)" strokeDasharray="6 3" label={{ value: `α ${alpha}`, position: "insideBottomLeft", fill: "var(--alpha)", fontSize: 11 }} />
          <Line dataKey="naive" name="Naive p" stroke="var(--holdout)" strokeDasharray="5 3" strokeWidth={1.8} dot={false} isAnimationActive={false} />
          <Line dataKey="sequential" name="Always-valid p" stroke="var(--treatment)" strokeWidth={2.2} dot={false} isAnimationActive={false} />
          {stop ? <ReferenceDot x={stop.date} y={floor(stop.fixed.p) ?? P_FLOOR} r={5} fill="var(--marker)" stroke="none" /> : null}
        </ComposedChart>
      </ResponsiveContainer>
    </ChartFrame>
  );
}
