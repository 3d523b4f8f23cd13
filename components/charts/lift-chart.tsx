"use client";

import { Area, CartesianGrid, ComposedChart, Line, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import type { StatusDay } from "@/lib/campaigns/campaign-status";
import { ChartFrame, LegendItem } from "./chart-frame";

export interface LiftChartProps {
  campaignName: string;
  days: StatusDay[];
  /** The smallest absolute lift worth having (same unit as the lift), drawn as a line. */
  minimumLift: number | null;
  /** Display: a conversion lift in percentage points, a mean lift in its unit. */
  unit: { scale: number; suffix: string; digits: number };
}

const axisTick = { fill: "var(--axis)", fontSize: 12 };

/** Lift over time: the always-valid confidence sequence as a filled band, the fixed-horizon interval as a dashed outline, with the zero and MDE lines. */
export function LiftChart({ campaignName, days, minimumLift, unit }: LiftChartProps) {
  const show = (value: number | null | undefined) => (value === null || value === undefined || !Number.isFinite(value) ? null : value * unit.scale);
  const data = days.map((day) => {
    const cs = day.lift.cs;
    const ci = day.lift.ci;
    return {
      date: day.date,
      estimate: show(day.lift.absolute),
      band: cs && cs[0] !== null && cs[1] !== null ? [show(cs[0]), show(cs[1])] : null,
      ciLow: show(ci?.[0]),
      ciHigh: show(ci?.[1]),
    };
  });
  const text = (value: number | null | undefined) => (value === null || value === undefined ? "—" : `${value > 0 ? "+" : value < 0 ? "−" : ""}${Math.abs(value).toFixed(unit.digits)}${unit.suffix}`);
  const mde = minimumLift === null ? null : minimumLift * unit.scale;
  return (
    <ChartFrame
      testId="lift-chart"
      title="Lift over time"
      description={
        <>
          The difference treatment minus holdout{unit.suffix.trim() ? ` in ${unit.suffix.trim()}` : ""}, day by day. The filled band is the always-valid confidence
          sequence: it holds however often you look. The dashed outline is the fixed-horizon interval, valid only on the planned last day.
        </>
      }
      legend={
        <>
          <LegendItem kind="solid" colour="--treatment" label="Estimated lift" />
          <LegendItem kind="fill" colour="--band" label="Always-valid sequence" />
          <LegendItem kind="outline" colour="--outline" label="Fixed-horizon interval" />
          <LegendItem kind="dashed" colour="--axis" label="Zero" />
          {mde !== null ? <LegendItem kind="dashed" colour="--alpha" label="Minimum lift worth having" /> : null}
        </>
      }
      fileParts={[campaignName, "lift"]}
      table={{
        columns: [
          { label: "Day", csv: "date" },
          { label: "Lift", csv: "lift", numeric: true },
          { label: "Always-valid low", csv: "sequence_low", numeric: true },
          { label: "Always-valid high", csv: "sequence_high", numeric: true },
          { label: "Fixed-horizon low", csv: "interval_low", numeric: true },
          { label: "Fixed-horizon high", csv: "interval_high", numeric: true },
        ],
        rows: days.map((day) => ({
          shown: [day.date, text(show(day.lift.absolute)), text(show(day.lift.cs?.[0])), text(show(day.lift.cs?.[1])), text(show(day.lift.ci?.[0])), text(show(day.lift.ci?.[1]))],
          raw: [day.date, day.lift.absolute, day.lift.cs?.[0], day.lift.cs?.[1], day.lift.ci?.[0], day.lift.ci?.[1]],
        })),
      }}
    >
      <ResponsiveContainer width="100%" height="100%">
        <ComposedChart data={data} margin={{ top: 8, right: 12, bottom: 4, left: 4 }} accessibilityLayer={false}>
          <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
          <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" minTickGap={24} />
          <YAxis tick={axisTick} stroke="var(--grid)" width={56} tickFormatter={(value: number) => value.toFixed(Math.min(unit.digits, 1))} />
          <Tooltip
            contentStyle={{ background: "var(--tooltip-bg, #fff)", borderColor: "var(--grid)", fontSize: 12 }}
            formatter={(value, name) => [Array.isArray(value) ? `${text(value[0] as number)} to ${text(value[1] as number)}` : text(value as number), String(name)]}
          />
          <Area dataKey="band" name="Always-valid sequence" stroke="none" fill="var(--band)" fillOpacity={0.75} isAnimationActive={false} connectNulls />
          <Line dataKey="ciLow" name="Fixed-horizon low" stroke="var(--outline)" strokeDasharray="4 3" dot={false} strokeWidth={1.3} isAnimationActive={false} />
          <Line dataKey="ciHigh" name="Fixed-horizon high" stroke="var(--outline)" strokeDasharray="4 3" dot={false} strokeWidth={1.3} isAnimationActive={false} />
          <Line dataKey="estimate" name="Estimated lift" stroke="var(--treatment)" strokeWidth={2.2} dot={false} isAnimationActive={false} />
          <ReferenceLine y={0} stroke="var(--axis)" strokeDasharray="6 3" label={{ value: "0", position: "insideLeft", fill: "var(--axis)", fontSize: 11 }} />
          {mde !== null ? (
            <ReferenceLine y={mde} stroke="var(--alpha)" strokeDasharray="6 3" label={{ value: "Minimum worth having", position: "insideTopLeft", fill: "var(--alpha)", fontSize: 11 }} />
          ) : null}
        </ComposedChart>
      </ResponsiveContainer>
    </ChartFrame>
  );
}
