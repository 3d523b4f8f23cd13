"use client";

import { formatPercent } from "@/components/dashboard/format";
import { ChartFrame, LegendItem } from "./chart-frame";
import { PeekingCostPlot } from "./lazy-plots";

export interface PeekingLook {
  date: string;
  daysRun: number;
  /** Exact false-positive rate of a naive test repeated on every look up to this day (lib/sequential via the worker). */
  cost: number;
}

/** The cost of peeking so far, in a sentence and a small chart of how it grows with the looks. */
export function PeekingCostChart({ campaignName, looks, alpha }: { campaignName: string; looks: PeekingLook[]; alpha: number }) {
  const last = looks.at(-1);
  return (
    <ChartFrame
      testId="peeking-cost-chart"
      title="The cost of peeking so far"
      description={
        last ? (
          <>
            Re-running the fixed-horizon test on each of the {looks.length} daily looks so far gives a{" "}
            <strong className="font-semibold text-tremor-content-strong dark:text-dark-tremor-content-strong">{formatPercent(last.cost)}</strong> chance of a false
            call when the campaign has no effect, against the {formatPercent(alpha, 0)} you planned for. The always-valid numbers above keep it at {formatPercent(alpha, 0)}.
            Exact, by recursive numerical integration (Armitage, McPherson &amp; Rowe 1969).
          </>
        ) : (
          "No looks yet: the cost appears once both arms have counts and the worker has analysed them."
        )
      }
      legend={
        <>
          <LegendItem kind="solid" colour="--holdout" label="False-positive rate of daily naive tests" />
          <LegendItem kind="dashed" colour="--alpha" label={`Planned α = ${alpha}`} />
        </>
      }
      fileParts={[campaignName, "cost-of-peeking"]}
      table={{
        columns: [
          { label: "Day", csv: "date" },
          { label: "Look", csv: "look", numeric: true },
          { label: "False-positive rate so far", csv: "false_positive_rate", numeric: true },
        ],
        rows: looks.map((look, index) => ({ shown: [look.date, index + 1, formatPercent(look.cost, 2)], raw: [look.date, index + 1, look.cost] })),
      }}
    >
      <PeekingCostPlot data={looks.map((look, index) => ({ look: index + 1, cost: look.cost }))} alpha={alpha} />
    </ChartFrame>
  );
}
