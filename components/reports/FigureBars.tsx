"use client";

import { Axis, BarSeries, buildChartTheme, Grid, XYChart } from "@visx/xychart";

export interface Bar {
  label: string;
  value: number;
  /** A colour token of the palette, e.g. "tide". */
  tone: "tide" | "amberline" | "coral" | "ink-500" | "ink-300";
}

// Axis and grid lines take the surrounding text colour, so both themes read well.
const theme = buildChartTheme({
  backgroundColor: "transparent",
  colors: ["currentColor"],
  gridColor: "currentColor",
  gridColorDark: "currentColor",
  tickLength: 4,
  svgLabelSmall: { fill: "currentColor", fontSize: 11 },
  svgLabelBig: { fill: "currentColor", fontSize: 12 },
});

/** A small bar chart of counts with an accessible name and the figures as a list for screen readers. */
export function FigureBars({ title, bars, height = 180 }: { title: string; bars: Bar[]; height?: number }) {
  const max = Math.max(1, ...bars.map((b) => b.value));
  return (
    <figure className="rounded-lg border border-ink-700 bg-ink-900 p-3" aria-label={title}>
      <figcaption className="mb-1 text-sm font-medium text-ink-300">{title}</figcaption>
      {/* XYChart measures this box for its width; the box needs its own height, or it measures 0. */}
      <div className="text-ink-500" style={{ height }} role="img" aria-label={`${title}: ${bars.map((b) => `${b.label} ${b.value}`).join(", ")}`}>
        <XYChart
          height={height}
          theme={theme}
          margin={{ top: 8, right: 8, bottom: 28, left: 36 }}
          xScale={{ type: "band", paddingInner: 0.35, paddingOuter: 0.2 }}
          yScale={{ type: "linear", domain: [0, max], nice: true }}
        >
          <Grid columns={false} numTicks={Math.min(4, max)} lineStyle={{ strokeOpacity: 0.15 }} />
          <BarSeries
            dataKey={title}
            data={bars}
            xAccessor={(b: Bar) => b.label}
            yAccessor={(b: Bar) => b.value}
            colorAccessor={(b: Bar) => `rgb(var(--${b.tone}))`}
          />
          <Axis orientation="bottom" hideTicks strokeWidth={0} />
          <Axis orientation="left" numTicks={Math.min(4, max)} hideAxisLine tickFormat={(v: number) => (Number.isInteger(v) ? String(v) : "")} />
        </XYChart>
      </div>
    </figure>
  );
}
