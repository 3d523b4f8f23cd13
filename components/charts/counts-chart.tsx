"use client";

import { formatCount } from "@/components/dashboard/format";
import { ChartFrame, LegendItem } from "./chart-frame";
import { CountsPlot } from "./lazy-plots";

export interface CountsDay {
  date: string;
  /** Per arm key: that day's new units and outcome sum, and the running totals. */
  arms: Record<string, { units: number; sum: number; cumulativeUnits: number; cumulativeSum: number; revised: boolean } | undefined>;
}

const TREATMENT_STYLES = [
  { colour: "--treatment", dash: undefined },
  { colour: "--treatment-2", dash: "1 3" },
  { colour: "--treatment", dash: "8 3 1 3" },
];

/** Daily and cumulative units per arm: the chart draws the cumulative units, the table has every number. */
export function CountsChart({
  campaignName,
  arms,
  days,
  outcomeLabel,
}: {
  campaignName: string;
  arms: { key: string; name: string; isHoldout: boolean }[];
  days: CountsDay[];
  outcomeLabel: string;
}) {
  const style = (arm: { isHoldout: boolean }, index: number) => (arm.isHoldout ? { colour: "--holdout", dash: "5 3" } : TREATMENT_STYLES[index % TREATMENT_STYLES.length]);
  const treatments = arms.filter((arm) => !arm.isHoldout);
  const styleOf = (arm: (typeof arms)[number]) => style(arm, treatments.indexOf(arm));
  const data = days.map((day) => Object.fromEntries([["date", day.date], ...arms.map((arm) => [arm.key, day.arms[arm.key]?.cumulativeUnits ?? null])]));
  const columns = [
    { label: "Day", csv: "date" },
    ...arms.flatMap((arm) => [
      { label: `${arm.name} units`, csv: `${arm.key}_units`, numeric: true },
      { label: `${arm.name} ${outcomeLabel}`, csv: `${arm.key}_${outcomeLabel.replace(/\W+/g, "_")}`, numeric: true },
      { label: `${arm.name} units so far`, csv: `${arm.key}_cumulative_units`, numeric: true },
      { label: `${arm.name} ${outcomeLabel} so far`, csv: `${arm.key}_cumulative_${outcomeLabel.replace(/\W+/g, "_")}`, numeric: true },
    ]),
  ];
  return (
    <ChartFrame
      testId="counts-chart"
      title="Units per arm"
      description="Cumulative units of each arm. The table shows each day's new units and outcomes and the running totals; a revised day is marked."
      legend={arms.map((arm) => {
        const { colour, dash } = styleOf(arm);
        return <LegendItem key={arm.key} kind={dash ? "dashed" : "solid"} colour={colour} label={`${arm.name}${arm.isHoldout ? " (holdout)" : ""}`} />;
      })}
      fileParts={[campaignName, "counts"]}
      table={{
        columns,
        rows: days.map((day) => ({
          shown: [
            day.date,
            ...arms.flatMap((arm) => {
              const count = day.arms[arm.key];
              return count
                ? [`${formatCount(count.units)}${count.revised ? " (revised)" : ""}`, formatCount(count.sum), formatCount(count.cumulativeUnits), formatCount(count.cumulativeSum)]
                : ["—", "—", "—", "—"];
            }),
          ],
          raw: [day.date, ...arms.flatMap((arm) => { const count = day.arms[arm.key]; return [count?.units, count?.sum, count?.cumulativeUnits, count?.cumulativeSum]; })],
        })),
      }}
    >
      <CountsPlot data={data} lines={arms.map((arm) => ({ key: arm.key, name: arm.name, ...styleOf(arm) }))} />
    </ChartFrame>
  );
}
