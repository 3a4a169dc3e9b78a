"use client";

import { ParentSize } from "@visx/responsive";
import { Annotation, AnnotationLineSubject, Axis, buildChartTheme, GlyphSeries, Grid, LineSeries, Tooltip, XYChart } from "@visx/xychart";
import type { CertaintyCurve, CurveMark, CurvePoint } from "@/lib/protocol/what-if";

/** Series colours follow the page theme through the CSS colour variables. */
const theme = buildChartTheme({
  backgroundColor: "transparent",
  colors: ["rgb(var(--tide))", "rgb(var(--amberline))", "rgb(var(--coral))"],
  gridColor: "rgb(var(--ink-700))",
  gridColorDark: "rgb(var(--ink-500))",
  tickLength: 4,
  svgLabelSmall: { fill: "rgb(var(--ink-300))", fontSize: 11 },
  svgLabelBig: { fill: "rgb(var(--ink-300))", fontSize: 12 },
  xAxisLineStyles: { stroke: "rgb(var(--ink-500))" },
  yAxisLineStyles: { stroke: "rgb(var(--ink-500))" },
  xTickLineStyles: { stroke: "rgb(var(--ink-500))" },
  yTickLineStyles: { stroke: "rgb(var(--ink-500))" },
});

const x = (p: CurvePoint | CurveMark) => p.step;
const y = (p: CurvePoint) => p.tileMass;

export interface ChartCurve {
  key: string;
  curve: CertaintyCurve;
}

/**
 * Certainty (mass on the most likely tile) after each step, one line per curve, with the
 * hold threshold, the mission's holds and releases, and the step the replay shows. A click
 * picks the step under the pointer.
 */
export function CertaintyChart({ curves, step, onPick }: { curves: ChartCurve[]; step: number; onPick?: (step: number) => void }) {
  const first = curves[0]?.curve;
  if (!first || first.points.length === 0) return null;
  const last = first.points.at(-1)?.step ?? 0;
  const threshold = [
    { step: 0, at: 0, tileMass: first.holdBelow, entropy: 0 },
    { step: last, at: 0, tileMass: first.holdBelow, entropy: 0 },
  ];
  const markY = (m: CurveMark) => first.points.find((p) => p.step === m.step)?.tileMass ?? 0;
  return (
    <figure data-testid="certainty-chart" aria-label="Certainty over the mission's steps" className="text-ink-300">
      <div className="h-[220px] w-full">
        <ParentSize>
          {({ width }) => (
      <XYChart
        width={width}
        height={220}
        margin={{ top: 18, right: 16, bottom: 40, left: 48 }}
        xScale={{ type: "linear", domain: [0, Math.max(1, last)] }}
        yScale={{ type: "linear", domain: [0, 1] }}
        theme={theme}
        onPointerUp={({ datum }) => {
          const d = datum as Partial<CurvePoint> | undefined;
          if (onPick && typeof d?.step === "number") onPick(d.step);
        }}
      >
        <Grid columns={false} numTicks={5} />
        <Axis orientation="bottom" label="step" labelOffset={14} numTicks={Math.min(8, Math.max(1, last))} tickFormat={(v: number) => (Number.isInteger(v) ? String(v) : "")} />
        <Axis orientation="left" numTicks={5} tickFormat={(v: number) => `${Math.round(v * 100)} %`} />
        {curves.map((c) => (
          <LineSeries key={c.key} dataKey={c.key} data={c.curve.points} xAccessor={x} yAccessor={y} strokeWidth={c.key === "live models" ? 2 : 1.5} />
        ))}
        <LineSeries dataKey="hold threshold" data={threshold} xAccessor={x} yAccessor={y} strokeDasharray="4 4" strokeWidth={1} colorAccessor={() => "rgb(var(--coral))"} />
        <GlyphSeries
          dataKey="holds"
          data={first.marks}
          xAccessor={x}
          yAccessor={markY}
          size={9}
          colorAccessor={(m: CurveMark) => (m.kind === "hold" ? "rgb(var(--coral))" : "rgb(var(--tide))")}
        />
        <Annotation dataKey={curves[0].key} datum={first.points.find((p) => p.step === step) ?? first.points[0]}>
          <AnnotationLineSubject stroke="rgb(var(--ink-300))" strokeWidth={1} />
        </Annotation>
        <Tooltip<CurvePoint | CurveMark>
          snapTooltipToDatumX
          showVerticalCrosshair
          renderTooltip={({ tooltipData }) => {
            const nearest = tooltipData?.nearestDatum;
            if (!nearest) return null;
            const stepAt = nearest.datum.step;
            return (
              <div className="space-y-0.5 text-xs">
                <div className="font-mono">step {stepAt}</div>
                {curves.map((c) => {
                  const p = c.curve.points.find((q) => q.step === stepAt);
                  return p ? (
                    <div key={c.key}>
                      {c.key}: {(p.tileMass * 100).toFixed(1)} %
                    </div>
                  ) : null;
                })}
                {first.marks
                  .filter((m) => m.step === stepAt)
                  .map((m) => (
                    <div key={`${m.kind}-${m.at}`}>
                      {m.kind}
                      {m.reason ? ` (${m.reason.replace("_", " ")})` : ""}
                    </div>
                  ))}
              </div>
            );
          }}
        />
      </XYChart>
          )}
        </ParentSize>
      </div>
      <figcaption className="flex flex-wrap gap-4 text-xs">
        {curves.map((c, i) => (
          <span key={c.key} className="flex items-center gap-1.5">
            <span className="inline-block h-0.5 w-4" style={{ background: theme.colors[i] }} />
            {c.key}: {c.curve.stepsBelowHold} of {c.curve.points.length} steps under the hold threshold
          </span>
        ))}
        <span className="flex items-center gap-1.5">
          <span className="inline-block h-0 w-4 border-t border-dashed border-coral" /> hold threshold {Math.round(first.holdBelow * 100)} %
        </span>
        <span className="flex items-center gap-1.5">
          <span className="inline-block size-2 rounded-full bg-coral" /> hold
          <span className="ml-2 inline-block size-2 rounded-full bg-tide" /> release
        </span>
      </figcaption>
    </figure>
  );
}
