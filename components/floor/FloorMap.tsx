"use client";

import clsx from "clsx";
import { useEffect, useRef, useState, type PointerEvent } from "react";
import { HEADINGS, type Heading } from "@/lib/vocabulary";
import { useFloorCommands } from "./commands";
import { FloorTiles } from "./FloorTiles";
import { goalRefusal, headingRotationDeg, tileAtPoint, type TileCoord } from "./geometry";
import { HeatCanvas } from "./HeatCanvas";
import { MissionLayer } from "./MissionLayer";
import { RobotMarker } from "./RobotMarker";
import { useFloor, useFloorStore } from "./store";

function useBoxSize(ref: React.RefObject<HTMLElement | null>): { w: number; h: number } {
  const [size, setSize] = useState({ w: 0, h: 0 });
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const observer = new ResizeObserver(([entry]) => {
      const { width, height } = entry.contentRect;
      setSize((prev) => (Math.abs(prev.w - width) < 0.5 && Math.abs(prev.h - height) < 0.5 ? prev : { w: width, h: height }));
    });
    observer.observe(el);
    return () => observer.disconnect();
  }, [ref]);
  return size;
}

function HoverTile() {
  const hover = useFloor((s) => s.hover);
  if (!hover) return null;
  return <rect x={hover.col} y={hover.row} width={1} height={1} fill="none" className="pointer-events-none stroke-ink-100" strokeWidth={0.06} />;
}

/** Four heading arrows around the chosen tile, plus the tile itself for "heading unknown". */
function HeadingPicker({ tile, onPick }: { tile: TileCoord; onPick: (heading: Heading | null) => void }) {
  const cx = tile.col + 0.5;
  const cy = tile.row + 0.5;
  return (
    <g data-testid="heading-picker">
      <rect x={tile.col} y={tile.row} width={1} height={1} className="fill-amberline/25 stroke-amberline" strokeWidth={0.08} />
      <g
        role="button"
        aria-label="Heading unknown"
        className="cursor-pointer"
        onClick={(e) => {
          e.stopPropagation();
          onPick(null);
        }}
      >
        <circle cx={cx} cy={cy} r={0.3} className="fill-ink-900 stroke-amberline" strokeWidth={0.05} />
        <text x={cx} y={cy + 0.14} textAnchor="middle" fontSize={0.4} className="fill-amberline font-mono">
          ?
        </text>
      </g>
      {HEADINGS.map((h) => (
        <g
          key={h}
          role="button"
          aria-label={`Facing ${h}`}
          data-testid={`heading-${h}`}
          className="cursor-pointer"
          transform={`translate(${cx} ${cy}) rotate(${headingRotationDeg(h)})`}
          onClick={(e) => {
            e.stopPropagation();
            onPick(h);
          }}
        >
          <circle cy={-1.1} r={0.42} className="fill-ink-900 stroke-amberline" strokeWidth={0.06} />
          <path d="M 0 -1.36 L 0.22 -0.98 L -0.22 -0.98 Z" className="fill-amberline" />
        </g>
      ))}
    </g>
  );
}

/**
 * The floor view: tiles (SVG), belief heat (canvas), then missions, claims and robots
 * (SVG), all in one tile-unit coordinate system fitted to the available box. Each layer
 * is its own compositor layer (will-change), so a moving robot repaints the top SVG only
 * and never the thousands of tiles under it.
 */
export function FloorMap() {
  const store = useFloorStore();
  const plan = useFloor((s) => s.floorplan);
  const robotIds = useFloor((s) => s.robotIds);
  const pick = useFloor((s) => s.pick);
  const commands = useFloorCommands();
  const boxRef = useRef<HTMLDivElement>(null);
  const box = useBoxSize(boxRef);
  const tilePx = box.w > 0 && box.h > 0 ? Math.max(1, Math.min(box.w / plan.cols, box.h / plan.rows)) : 0;
  const widthPx = Math.floor(tilePx * plan.cols);
  const heightPx = Math.floor(tilePx * plan.rows);
  const labelSize = tilePx > 0 ? Math.max(0.55, 12 / tilePx) : 0.55;

  const tileOf = (event: PointerEvent<SVGSVGElement> | React.MouseEvent<SVGSVGElement>): TileCoord | null => {
    const rect = event.currentTarget.getBoundingClientRect();
    return tileAtPoint(plan, ((event.clientX - rect.left) / rect.width) * plan.cols, ((event.clientY - rect.top) / rect.height) * plan.rows);
  };

  const onTileClick = (tile: TileCoord | null) => {
    const s = store.getState();
    if (!tile || !commands.canCommand) return;
    const robotId = s.selectedId;
    if (!robotId) {
      s.notify("info", "Select a robot first (click it, or press J / K).");
      return;
    }
    if (s.pick.kind === "relocate") {
      s.setPick({ kind: "relocate", tile, heading: null });
      return;
    }
    const refusal = goalRefusal(plan, tile.row, tile.col);
    if (refusal) {
      s.notify("error", refusal);
      return;
    }
    s.setConfirm({ kind: "dispatch", robotId, goal: tile });
  };

  return (
    <div ref={boxRef} className="relative h-full min-h-0 w-full min-w-0">
      {tilePx > 0 && (
        <div className="absolute left-1/2 top-1/2 -translate-x-1/2 -translate-y-1/2" style={{ width: widthPx, height: heightPx }}>
          <svg className="absolute inset-0 will-change-transform" width={widthPx} height={heightPx} viewBox={`0 0 ${plan.cols} ${plan.rows}`} aria-hidden>
            <FloorTiles plan={plan} />
          </svg>
          <HeatCanvas widthPx={widthPx} heightPx={heightPx} />
          <svg
            data-testid="floor-map"
            role="application"
            aria-label={`${plan.name}, ${plan.rows} rows by ${plan.cols} columns${commands.canCommand ? "; click a tile to send the selected robot there" : ""}`}
            className={clsx("absolute inset-0 select-none will-change-transform", commands.canCommand ? (pick.kind === "relocate" ? "cursor-cell" : "cursor-crosshair") : "cursor-default")}
            width={widthPx}
            height={heightPx}
            overflow="visible"
            viewBox={`0 0 ${plan.cols} ${plan.rows}`}
            onPointerMove={(e) => store.getState().setHover(tileOf(e))}
            onPointerLeave={() => store.getState().setHover(null)}
            onClick={(e) => onTileClick(tileOf(e))}
          >
            <MissionLayer />
            <HoverTile />
            {robotIds.map((id) => (
              <RobotMarker key={id} robotId={id} labelSize={labelSize} />
            ))}
            {pick.kind === "relocate" && pick.tile && (
              <HeadingPicker
                tile={pick.tile}
                onPick={(heading) => {
                  const s = store.getState();
                  if (s.selectedId && pick.tile) s.setConfirm({ kind: "relocate", robotId: s.selectedId, tile: pick.tile, heading });
                }}
              />
            )}
          </svg>
        </div>
      )}
    </div>
  );
}
