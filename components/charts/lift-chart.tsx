"use client";

import type { StatusDay } from "@/lib/campaigns/campaign-status";
import { ChartFrame, LegendItem } from "./chart-frame";
import { LiftPlot } from "./lazy-plots";

export interface LiftChartProps {
  campaignName: string;
  days: StatusDay[];
  /** The smallest absolute lift worth having (same unit as the lift), drawn as a line. */
  minimumLift: number | null;
  /** Display: a conversion lift in percentage points, a mean lift in its unit. */
  unit: { scale: number; suffix: string; digits: number };
}

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
      <LiftPlot data={data} mde={mde} digits={unit.digits} text={text} />
    </ChartFrame>
  );
}
