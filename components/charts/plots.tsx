"use client";

import { Area, CartesianGrid, ComposedChart, Line, LineChart, ReferenceDot, ReferenceLine, ResponsiveContainer, Tooltip, XAxis, YAxis } from "recharts";
import { formatCount, formatP, formatPercent } from "@/components/dashboard/format";

// The drawing half of each chart: the only module that imports recharts, loaded in its own chunk (./lazy-plots).

const axisTick = { fill: "var(--axis)", fontSize: 12 };
const margin = { top: 8, right: 12, bottom: 4, left: 4 };

export interface LiftPoint {
  date: string;
  estimate: number | null;
  band: (number | null)[] | null;
  ciLow: number | null;
  ciHigh: number | null;
}

export function LiftPlot({ data, mde, digits, text }: { data: LiftPoint[]; mde: number | null; digits: number; text: (value: number | null | undefined) => string }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" minTickGap={24} />
        <YAxis tick={axisTick} stroke="var(--grid)" width={56} tickFormatter={(value: number) => value.toFixed(Math.min(digits, 1))} />
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
}: {
  data: { date: string; sequential: number | null; naive: number | null }[];
  alpha: number;
  floor: number;
  stop: { date: string; p: number } | null;
}) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" minTickGap={24} />
        <YAxis
          scale="log"
          domain={[floor, 1]}
          allowDataOverflow
          ticks={[1e-6, 1e-4, 0.01, 0.05, 1]}
          tickFormatter={(value: number) => (value >= 0.01 ? String(value) : value.toExponential(0))}
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

export function PeekingCostPlot({ data, alpha }: { data: { look: number; cost: number }[]; alpha: number }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <ComposedChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="look" tick={axisTick} stroke="var(--grid)" label={{ value: "looks", position: "insideBottomRight", offset: -2, fill: "var(--axis)", fontSize: 11 }} />
        <YAxis domain={[0, (max: number) => Math.max(0.1, Math.ceil(max * 20) / 20)]} tickFormatter={(value: number) => `${Math.round(value * 100)} %`} tick={axisTick} stroke="var(--grid)" width={48} />
        <Tooltip formatter={(value) => [formatPercent(value as number, 2), "False-positive rate"]} labelFormatter={(label) => `Look ${label}`} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
        <ReferenceLine y={alpha} stroke="var(--alpha)" strokeDasharray="6 3" />
        <Line dataKey="cost" name="False-positive rate" stroke="var(--holdout)" strokeWidth={2} dot={false} isAnimationActive={false} />
      </ComposedChart>
    </ResponsiveContainer>
  );
}

export function CountsPlot({ data, lines }: { data: Record<string, string | number | null>[]; lines: { key: string; name: string; colour: string; dash?: string }[] }) {
  return (
    <ResponsiveContainer width="100%" height="100%">
      <LineChart data={data} margin={margin} accessibilityLayer={false}>
        <CartesianGrid stroke="var(--grid)" strokeDasharray="2 4" />
        <XAxis dataKey="date" tick={axisTick} stroke="var(--grid)" minTickGap={24} />
        <YAxis tickFormatter={(value: number) => (value >= 1000 ? `${Math.round(value / 1000)}k` : String(value))} tick={axisTick} stroke="var(--grid)" width={52} />
        <Tooltip formatter={(value, name) => [formatCount(value as number), String(name)]} contentStyle={{ borderColor: "var(--grid)", fontSize: 12 }} />
        {lines.map((line) => (
          <Line key={line.key} dataKey={line.key} name={line.name} stroke={`var(${line.colour})`} strokeDasharray={line.dash} strokeWidth={2} dot={false} isAnimationActive={false} />
        ))}
      </LineChart>
    </ResponsiveContainer>
  );
}
