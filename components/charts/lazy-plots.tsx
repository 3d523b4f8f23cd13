"use client";

import { useSyncExternalStore } from "react";
import type * as Interactive from "./plots";
import { P_TICKS, categoryTicks, linearAxis, tickText, type LinearAxis } from "./scales";
import { StillPlot } from "./static-plot";

// recharts stays out of the page's first load: the plots arrive in one chunk, asked for as soon as this
// module runs on the client. Until then (and on the server) each plot is a still drawing of the same
// numbers on the same axes, so a chart is readable with the HTML and does not move when recharts takes over.

type Plots = typeof Interactive;
let loaded: Plots | null = null;
// A chunk that fails to load leaves the still drawing in place.
const loading = typeof window === "undefined" ? null : import("./plots").then((module) => (loaded = module), () => null);

function subscribe(onLoaded: () => void): () => void {
  let listening = true;
  void loading?.then(() => listening && onLoaded());
  return () => void (listening = false);
}

/** The interactive plots once their chunk has run; null on the server and while hydrating. */
function usePlots(): Plots | null {
  return useSyncExternalStore(
    subscribe,
    () => loaded,
    () => null,
  );
}

const describe = (what: string, labels: readonly string[], unit = "days") =>
  labels.length === 0 ? `${what}: nothing to draw yet.` : `${what}, ${labels.length} ${unit} from ${labels[0]} to ${labels.at(-1)}. Show table lists every number.`;

const ticksOf = (labels: readonly string[]) => {
  const chosen = new Set(categoryTicks(labels));
  return labels.flatMap((text, index) => (chosen.has(text) ? [{ index, text }] : []));
};

type LiftProps = Omit<Parameters<Plots["LiftPlot"]>[0], "y" | "xTicks">;

export function LiftPlot(props: LiftProps) {
  const plots = usePlots();
  const { data, mde, digits } = props;
  const y: LinearAxis = linearAxis(data.flatMap((point) => [point.estimate, point.ciLow, point.ciHigh, ...(point.band ?? [])]).concat(mde === null ? [] : [mde]));
  const dates = data.map((point) => point.date);
  if (plots) return <plots.LiftPlot {...props} y={y} xTicks={categoryTicks(dates)} />;
  return (
    <StillPlot
      label={describe("Lift over time", dates)}
      points={data.length}
      xTicks={ticksOf(dates)}
      y={{ ...y, format: tickText.lift(digits), width: 56 }}
      band={{ low: data.map((point) => point.band?.[0] ?? null), high: data.map((point) => point.band?.[1] ?? null), colour: "--band", opacity: 0.75 }}
      lines={[
        { values: data.map((point) => point.ciLow), colour: "--outline", width: 1.3, dash: "4 3" },
        { values: data.map((point) => point.ciHigh), colour: "--outline", width: 1.3, dash: "4 3" },
        { values: data.map((point) => point.estimate), colour: "--treatment", width: 2.2 },
      ]}
      references={[{ y: 0, colour: "--axis", text: "0" }, ...(mde === null ? [] : [{ y: mde, colour: "--alpha", text: "Minimum worth having", place: "below" as const }])]}
    />
  );
}

type PValueProps = Omit<Parameters<Plots["PValuePlot"]>[0], "xTicks">;

export function PValuePlot(props: PValueProps) {
  const plots = usePlots();
  const { data, alpha, floor, stop } = props;
  const dates = data.map((point) => point.date);
  if (plots) return <plots.PValuePlot {...props} xTicks={categoryTicks(dates)} />;
  const stopIndex = stop ? dates.indexOf(stop.date) : -1;
  return (
    <StillPlot
      label={describe("p-values over time", dates)}
      points={data.length}
      xTicks={ticksOf(dates)}
      y={{ scale: "log", domain: [floor, 1], ticks: P_TICKS, format: tickText.p, width: 52 }}
      lines={[
        { values: data.map((point) => point.naive), colour: "--holdout", width: 1.8, dash: "5 3" },
        { values: data.map((point) => point.sequential), colour: "--treatment", width: 2.2 },
      ]}
      references={[{ y: alpha, colour: "--alpha", text: `α ${alpha}`, place: "above" }]}
      marker={stop && stopIndex >= 0 ? { index: stopIndex, y: stop.p, colour: "--marker" } : undefined}
    />
  );
}

type PeekingProps = Omit<Parameters<Plots["PeekingCostPlot"]>[0], "y" | "xTicks">;

export function PeekingCostPlot(props: PeekingProps) {
  const plots = usePlots();
  const { data, alpha } = props;
  const y = linearAxis(data.map((point) => point.cost), { minimumTop: 0.1 });
  const looks = data.map((point) => String(point.look));
  if (plots) return <plots.PeekingCostPlot {...props} y={y} xTicks={categoryTicks(data.map((point) => point.look))} />;
  return (
    <StillPlot
      label={describe("False-positive rate of daily naive tests by look", looks, "looks")}
      points={data.length}
      xTicks={ticksOf(looks)}
      y={{ ...y, format: tickText.share, width: 48 }}
      lines={[{ values: data.map((point) => point.cost), colour: "--holdout", width: 2 }]}
      references={[{ y: alpha, colour: "--alpha" }]}
    />
  );
}

type CountsProps = Omit<Parameters<Plots["CountsPlot"]>[0], "y" | "xTicks">;

export function CountsPlot(props: CountsProps) {
  const plots = usePlots();
  const { data, lines } = props;
  const y = linearAxis(data.flatMap((row) => lines.map((line) => row[line.key] as number | null)));
  const dates = data.map((row) => String(row.date));
  if (plots) return <plots.CountsPlot {...props} y={y} xTicks={categoryTicks(dates)} />;
  return (
    <StillPlot
      label={describe("Cumulative units per arm", dates)}
      points={data.length}
      xTicks={ticksOf(dates)}
      y={{ ...y, format: tickText.count, width: 52 }}
      lines={lines.map((line) => ({ values: data.map((row) => row[line.key] as number | null), colour: line.colour, width: 2, dash: line.dash }))}
    />
  );
}
