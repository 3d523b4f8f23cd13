import { axisFraction } from "./scales";

// A still drawing of a chart, rendered with the page's HTML so the numbers are visible before the
// interactive chart (recharts, in its own chunk) arrives. Same margins, axes and scales as ./plots.

/** The plot margins of ./plots: recharts' chart margin plus the x axis' default 30 px. */
export const PLOT_MARGIN = { top: 8, right: 12, bottom: 4 + 30, left: 4 };

const VIEW = 1000;

export interface StillLine {
  values: readonly (number | null)[];
  colour: string;
  width: number;
  dash?: string;
}

export interface StillPlotProps {
  /** What the plot shows, read out in place of the drawing (the frame's table has the numbers). */
  label: string;
  /** X categories in order, drawn evenly spaced end to end (recharts' point scale). */
  points: number;
  xTicks: { index: number; text: string }[];
  y: { scale?: "linear" | "log"; domain: readonly [number, number]; ticks: readonly number[]; format: (value: number) => string; width: number };
  lines: StillLine[];
  band?: { low: readonly (number | null)[]; high: readonly (number | null)[]; colour: string; opacity: number };
  references?: { y: number; colour: string; text?: string; place?: "above" | "on" | "below" }[];
  marker?: { index: number; y: number; colour: string };
}

export function StillPlot({ label, points, xTicks, y, lines, band, references = [], marker }: StillPlotProps) {
  const x = (index: number) => (points <= 1 ? VIEW / 2 : (index / (points - 1)) * VIEW);
  const yAt = (value: number) => (1 - axisFraction(value, y.domain, y.scale)) * VIEW;
  const finite = (value: number | null | undefined): value is number => value !== null && value !== undefined && Number.isFinite(value);
  const path = (values: readonly (number | null)[]) => {
    let d = "";
    let drawing = false;
    values.forEach((value, index) => {
      if (!finite(value)) return void (drawing = false);
      d += `${drawing ? "L" : "M"}${x(index).toFixed(1)},${yAt(value).toFixed(1)}`;
      drawing = true;
    });
    return d;
  };
  let bandPath = "";
  if (band) {
    const inside = band.low.map((low, index) => index).filter((index) => finite(band.low[index]) && finite(band.high[index]));
    if (inside.length > 1) {
      bandPath =
        inside.map((index, order) => `${order === 0 ? "M" : "L"}${x(index).toFixed(1)},${yAt(band.high[index]!).toFixed(1)}`).join("") +
        [...inside].reverse().map((index) => `L${x(index).toFixed(1)},${yAt(band.low[index]!).toFixed(1)}`).join("") +
        "Z";
    }
  }
  const area = { left: PLOT_MARGIN.left + y.width, right: PLOT_MARGIN.right, top: PLOT_MARGIN.top, bottom: PLOT_MARGIN.bottom };
  const top = (fraction: number) => `calc(${area.top}px + ${fraction} * (100% - ${area.top + area.bottom}px))`;
  const left = (fraction: number) => `calc(${area.left}px + ${fraction} * (100% - ${area.left + area.right}px))`;
  const text = "absolute whitespace-nowrap text-xs leading-none";
  return (
    <div data-still-plot role="img" aria-label={label} className="relative h-full w-full text-[color:var(--axis)]">
      <svg
        aria-hidden="true"
        className="absolute overflow-visible"
        style={{ left: area.left, right: area.right, top: area.top, bottom: area.bottom, width: `calc(100% - ${area.left + area.right}px)`, height: `calc(100% - ${area.top + area.bottom}px)` }}
        viewBox={`0 0 ${VIEW} ${VIEW}`}
        preserveAspectRatio="none"
      >
        <g style={{ stroke: "var(--grid)" }} strokeDasharray="2 4" vectorEffect="non-scaling-stroke">
          {y.ticks.map((tick) => (
            <line key={`y${tick}`} x1={0} x2={VIEW} y1={yAt(tick)} y2={yAt(tick)} vectorEffect="non-scaling-stroke" />
          ))}
          {xTicks.map((tick) => (
            <line key={`x${tick.index}`} x1={x(tick.index)} x2={x(tick.index)} y1={0} y2={VIEW} vectorEffect="non-scaling-stroke" />
          ))}
        </g>
        <path d={`M0,0V${VIEW}H${VIEW}`} fill="none" style={{ stroke: "var(--grid)" }} vectorEffect="non-scaling-stroke" />
        {bandPath ? <path d={bandPath} style={{ fill: `var(${band!.colour})` }} fillOpacity={band!.opacity} stroke="none" /> : null}
        {references.map((reference) => (
          <line key={`r${reference.y}`} x1={0} x2={VIEW} y1={yAt(reference.y)} y2={yAt(reference.y)} style={{ stroke: `var(${reference.colour})` }} strokeDasharray="6 3" vectorEffect="non-scaling-stroke" />
        ))}
        {lines.map((line, index) => (
          <path key={index} data-series d={path(line.values)} fill="none" style={{ stroke: `var(${line.colour})` }} strokeWidth={line.width} strokeDasharray={line.dash} vectorEffect="non-scaling-stroke" />
        ))}
      </svg>
      {y.ticks.map((tick) => (
        <span key={tick} aria-hidden="true" className={text} style={{ top: top(1 - axisFraction(tick, y.domain, y.scale)), right: `calc(100% - ${area.left - 8}px)`, transform: "translateY(-50%)" }}>
          {y.format(tick)}
        </span>
      ))}
      {xTicks.map((tick) => (
        <span key={tick.index} aria-hidden="true" className={text} style={{ top: `calc(100% - ${area.bottom - 10}px)`, left: left(points <= 1 ? 0.5 : tick.index / (points - 1)), transform: "translateX(-50%)" }}>
          {tick.text}
        </span>
      ))}
      {references.map((reference) =>
        reference.text ? (
          <span
            key={reference.y}
            aria-hidden="true"
            className={`${text} text-[11px]`}
            style={{ color: `var(${reference.colour})`, left: area.left + 6, top: top(1 - axisFraction(reference.y, y.domain, y.scale)), transform: reference.place === "above" ? "translateY(-120%)" : reference.place === "below" ? "translateY(30%)" : "translateY(-50%)" }}
          >
            {reference.text}
          </span>
        ) : null,
      )}
      {marker ? (
        <span
          aria-hidden="true"
          className="absolute h-2.5 w-2.5 rounded-full"
          style={{ background: `var(${marker.colour})`, left: left(points <= 1 ? 0.5 : marker.index / (points - 1)), top: top(1 - axisFraction(marker.y, y.domain, y.scale)), transform: "translate(-50%, -50%)" }}
        />
      ) : null}
    </div>
  );
}
