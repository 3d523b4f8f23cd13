"use client";

import { Area, CartesianGrid, ComposedChart, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatCount, formatP, formatPercent } from "@/components/dashboard/format";
import { P_TICKS, tickText, type LinearAxis } from "./scales";

// The drawing half of each chart: the only module that imports recharts, loaded in its own chunk (./lazy-plots).
// Axes come computed (./scales) so they match the still drawing shown before this chunk runs.

const axisTick = { fill: "var(--axis)", fontSize: 12 };
const margin = { top: 8, right: 12, bottom: 4, left: 4 };

export interface LiftPoint {
  date: string;
  estimate: number | null;
  band: (number | null)[] | null;
  ciLow: number | null;
  ciHigh: number | null;
}

export function LiftPlot({ data, mde, digits, text, y, xTicks }: { data: LiftPoint[]; mde: number | null; digits: number; text: (value: number | null | undefined) => string; y: LinearAxis; xTicks: string[] }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" ticks={xTicks} interval={0} />
        <YAxis domain={y.domain} ticks={y.ticks} allowDataOverflow tick={axisTick} stroke="var(--grid)" width={56} tickFormatter={tickText.lift(digits)} />
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
  );
}

export function PValuePlot({
  data,
  alpha,
  floor,
  stop,
  xTicks,
}: {
  data: { date: string; sequential: number | null; naive: number | null }[];
  alpha: number;
  floor: number;
  stop: { date: string; p: number } | null;
  xTicks: string[];
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" ticks={xTicks} interval={0} />
        <YAxis
          scale="log"
          domain={[floor, 1]}
          allowDataOverflow
          ticks={P_TICKS}
          tickFormatter={tickText.p}
          tick={axisTick}
          stroke="var(--grid)"
          width={52}
        />
        <Tooltip formatter={(value, name) => [formatP(value as number), String(name)]} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
        <ReferenceLine y={alpha} stroke="var(--alpha)" strokeDasharray="6 3" label={{ value: `α ${alpha}`, position: "insideBottomLeft", fill: "var(--alpha)", fontSize: 11 }} />
        <Line dataKey="naive" name="Naive p" stroke="var(--holdout)" strokeDasharray="5 3" strokeWidth={1.8} dot={false} isAnimationActive={false} />
        <Line dataKey="sequential" name="Always-valid p" stroke="var(--treatment)" strokeWidth={2.2} dot={false} isAnimationActive={false} />
        {stop ? <ReferenceDot x={stop.date} y={stop.p} r={5} fill="var(--marker)" stroke="none" /> : null}
      </ComposedChart>
    </ResponsiveContainer>
  );
}

export function PeekingCostPlot({ data, alpha, y, xTicks }: { data: { look: number; cost: number }[]; alpha: number; y: LinearAxis; xTicks: number[] }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="look" tick={axisTick} stroke="var(--grid)" ticks={xTicks} interval={0} label={{ value: "looks", position: "insideBottomRight", offset: -2, fill: "var(--axis)", fontSize: 11 }} />
        <YAxis domain={y.domain} ticks={y.ticks} allowDataOverflow tickFormatter={tickText.share} tick={axisTick} stroke="var(--grid)" width={48} />
        <Tooltip formatter={(value) => [formatPercent(value as number, 2), "False-positive rate"]} labelFormatter={(label) => `Look ${label}`} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
        <ReferenceLine y={alpha} stroke="var(--alpha)" strokeDasharray="6 3" />
        <Line dataKey="cost" name="False-positive rate" stroke="var(--holdout)" strokeWidth={2} dot={false} isAnimationActive={false} />
      </ComposedChart>
    </ResponsiveContainer>
  );
}

export function CountsPlot({
  data,
  lines,
  y,
  xTicks,
}: {
  data: Record<string, string | number | null>[];
  lines: { key: string; name: string; colour: string; dash?: string }[];
  y: LinearAxis;
  xTicks: string[];
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" ticks={xTicks} interval={0} />
        <YAxis domain={y.domain} ticks={y.ticks} allowDataOverflow tickFormatter={tickText.count} tick={axisTick} stroke="var(--grid)" width={52} />
        <Tooltip formatter={(value, name) => [formatCount(value as number), String(name)]} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
        {lines.map((line) => (
          <Line key={line.key} dataKey={line.key} name={line.name} stroke={`var(${line.colour})`} strokeDasharray={line.dash} strokeWidth={2} dot={false} isAnimationActive={false} />
        ))}
      </LineChart>
    </ResponsiveContainer>
  );
}
