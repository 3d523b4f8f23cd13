"use client";

import dynamic from "next/dynamic";

// recharts stays out of the page's first load: the plots arrive in one chunk, asked for as soon as
// this module runs on the client (in parallel with hydration). The placeholder fills the frame's fixed height.
if (typeof window !== "undefined") void import("./plots");

function PlotPlaceholder() {
  return <div className="h-full w-full rounded-tremor-default bg-tremor-background-subtle dark:bg-dark-tremor-background-subtle" aria-hidden="true" />;
}

export const LiftPlot = dynamic(() => import("./plots").then((module) => module.LiftPlot), { ssr: false, loading: PlotPlaceholder });
export const PValuePlot = dynamic(() => import("./plots").then((module) => module.PValuePlot), { ssr: false, loading: PlotPlaceholder });
export const PeekingCostPlot = dynamic(() => import("./plots").then((module) => module.PeekingCostPlot), { ssr: false, loading: PlotPlaceholder });
export const CountsPlot = dynamic(() => import("./plots").then((module) => module.CountsPlot), { ssr: false, loading: PlotPlaceholder });
