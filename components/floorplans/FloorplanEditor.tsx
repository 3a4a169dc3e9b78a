"use client";

import clsx from "clsx";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState, type PointerEvent as ReactPointerEvent } from "react";
import { floorplanToJson } from "@/lib/floorplan/json";
import type { Floorplan, Tile } from "@/lib/floorplan/types";
import { FLOORPLAN_MAX_SIDE } from "@/lib/floorplan/plan";
import type { FloorplanView } from "@/lib/protocol/ops-feed";
import { planOfView } from "./convert";
import { historyOf, historyPush, historyRedo, historyUndo } from "./history";
import { fillRect, paintTiles, resizePlan, strokeTiles, type Brush } from "./paint";
import { TileCanvas } from "./TileCanvas";
import { clampedTileAtPoint, fitViewport, panBy, tileAtPoint, zoomAt, type Viewport } from "./viewport";

type Tool = "paint" | "rect" | "pan";
type BrushKind = Brush["kind"];

const BRUSHES: { kind: BrushKind; label: string; key: string }[] = [
  { kind: "blocked", label: "Blocked", key: "1" },
  { kind: "free", label: "Free", key: "2" },
  { kind: "mark", label: "Floor mark", key: "3" },
  { kind: "dock", label: "Dock", key: "4" },
  { kind: "nogo", label: "No-go", key: "5" },
];

const TOOLS: { tool: Tool; label: string; key: string }[] = [
  { tool: "paint", label: "Paint", key: "p" },
  { tool: "rect", label: "Rectangle", key: "r" },
  { tool: "pan", label: "Pan", key: "h" },
];

const CANVAS_HEIGHT = 520;

interface Stroke {
  pointerId: number;
  mode: "paint" | "rect" | "pan";
  start: Tile;
  last: Tile;
  lastPoint: { x: number; y: number };
  plan: Floorplan;
}

function pointOf(e: ReactPointerEvent<HTMLCanvasElement>) {
  const box = e.currentTarget.getBoundingClientRect();
  return { x: e.clientX - box.left, y: e.clientY - box.top };
}

/**
 * The admin's tile editor: paint with the mouse (drag), fill rectangles, pan (the Pan tool,
 * the middle button or Space held), zoom with the wheel, undo/redo, resize, and save the
 * grid as a new version with a note. A stroke edits a working copy and enters the history
 * once, when the button is released.
 */
export function FloorplanEditor({ floorplanId, initial: initialView, latestVersion }: { floorplanId: number; initial: FloorplanView; latestVersion: number }) {
  const router = useRouter();
  const [initial] = useState(() => planOfView(initialView));
  const [history, setHistory] = useState(() => historyOf(initial));
  const [working, setWorking] = useState<Floorplan | null>(null);
  const [tool, setTool] = useState<Tool>("paint");
  const [brushKind, setBrushKind] = useState<BrushKind>("blocked");
  const [markClass, setMarkClass] = useState(1);
  const [view, setView] = useState<Viewport | null>(null);
  const [canvasWidth, setCanvasWidth] = useState(0);
  const [pendingRect, setPendingRect] = useState<{ a: Tile; b: Tile; brush: Brush } | null>(null);
  const [hover, setHover] = useState<Tile | null>(null);
  const [spaceHeld, setSpaceHeld] = useState(false);
  const [size, setSize] = useState({ rows: String(initial.rows), cols: String(initial.cols) });
  const [note, setNote] = useState("");
  const [status, setStatus] = useState<{ tone: "ok" | "error"; text: string } | null>(null);
  const [saving, setSaving] = useState(false);
  const stroke = useRef<Stroke | null>(null);

  const plan = working ?? history.present;
  const brush: Brush = useMemo(() => (brushKind === "mark" ? { kind: "mark", mark: markClass } : { kind: brushKind }), [brushKind, markClass]);
  const dirty = history.present !== initial;
  const shownView = view ?? (canvasWidth > 0 ? fitViewport(plan.rows, plan.cols, canvasWidth, CANVAS_HEIGHT) : undefined);

  const onSize = useCallback((width: number) => setCanvasWidth(width), []);
  const undo = useCallback(() => setHistory((h) => historyUndo(h)), []);
  const redo = useCallback(() => setHistory((h) => historyRedo(h)), []);

  useEffect(() => {
    const typing = (t: EventTarget | null) => t instanceof HTMLElement && (t.tagName === "INPUT" || t.tagName === "TEXTAREA" || t.tagName === "SELECT");
    const down = (e: KeyboardEvent) => {
      if (typing(e.target)) return;
      const mod = e.ctrlKey || e.metaKey;
      if (mod && e.key.toLowerCase() === "z") {
        e.preventDefault();
        if (e.shiftKey) redo();
        else undo();
      } else if (mod && e.key.toLowerCase() === "y") {
        e.preventDefault();
        redo();
      } else if (e.key === " ") {
        // Space still presses a focused button or link; elsewhere it holds the pan.
        if (e.target instanceof HTMLElement && (e.target.tagName === "BUTTON" || e.target.tagName === "A")) return;
        e.preventDefault();
        setSpaceHeld(true);
      } else if (!mod) {
        const b = BRUSHES.find((x) => x.key === e.key);
        const t = TOOLS.find((x) => x.key === e.key.toLowerCase());
        if (b) setBrushKind(b.kind);
        if (t) setTool(t.tool);
      }
    };
    const up = (e: KeyboardEvent) => {
      if (e.key === " ") setSpaceHeld(false);
    };
    window.addEventListener("keydown", down);
    window.addEventListener("keyup", up);
    return () => {
      window.removeEventListener("keydown", down);
      window.removeEventListener("keyup", up);
    };
  }, [undo, redo]);

  const onPointerDown = (e: ReactPointerEvent<HTMLCanvasElement>) => {
    if (!shownView || stroke.current) return;
    const point = pointOf(e);
    const panning = tool === "pan" || spaceHeld || e.button === 1;
    const tile = tileAtPoint(shownView, point.x, point.y, plan.rows, plan.cols);
    if (!panning && (e.button !== 0 || !tile)) return;
    e.currentTarget.setPointerCapture(e.pointerId);
    const at = tile ?? { row: 0, col: 0 };
    const mode = panning ? "pan" : tool === "rect" ? "rect" : "paint";
    const start = mode === "paint" ? paintTiles(history.present, [at], brush) : history.present;
    stroke.current = { pointerId: e.pointerId, mode, start: at, last: at, lastPoint: point, plan: start };
    if (mode === "paint") setWorking(start);
    if (mode === "rect") setPendingRect({ a: at, b: at, brush });
  };

  const onPointerMove = (e: ReactPointerEvent<HTMLCanvasElement>) => {
    if (!shownView) return;
    const point = pointOf(e);
    setHover(tileAtPoint(shownView, point.x, point.y, plan.rows, plan.cols));
    const s = stroke.current;
    if (!s || s.pointerId !== e.pointerId) return;
    if (s.mode === "pan") {
      setView(panBy(shownView, point.x - s.lastPoint.x, point.y - s.lastPoint.y));
      s.lastPoint = point;
      return;
    }
    const tile = clampedTileAtPoint(shownView, point.x, point.y, plan.rows, plan.cols);
    if (tile.row === s.last.row && tile.col === s.last.col) return;
    if (s.mode === "paint") {
      s.plan = paintTiles(s.plan, strokeTiles(s.last, tile), brush);
      setWorking(s.plan);
    } else {
      setPendingRect({ a: s.start, b: tile, brush });
    }
    s.last = tile;
  };

  const onPointerUp = (e: ReactPointerEvent<HTMLCanvasElement>) => {
    const s = stroke.current;
    if (!s || s.pointerId !== e.pointerId) return;
    stroke.current = null;
    if (s.mode === "paint") setHistory((h) => historyPush(h, s.plan));
    if (s.mode === "rect") setHistory((h) => historyPush(h, fillRect(h.present, s.start, s.last, brush)));
    setWorking(null);
    setPendingRect(null);
  };

  const applyResize = () => {
    const rows = Number(size.rows);
    const cols = Number(size.cols);
    if (!Number.isInteger(rows) || !Number.isInteger(cols) || rows < 1 || cols < 1 || rows > FLOORPLAN_MAX_SIDE || cols > FLOORPLAN_MAX_SIDE) {
      setStatus({ tone: "error", text: `Rows and columns must be whole numbers from 1 to ${FLOORPLAN_MAX_SIDE}.` });
      return;
    }
    setStatus(null);
    setHistory((h) => historyPush(h, resizePlan(h.present, rows, cols)));
    setView(null);
  };

  const save = async () => {
    if (note.trim() === "") {
      setStatus({ tone: "error", text: "Write a change note: say what changed in this version." });
      return;
    }
    setSaving(true);
    setStatus(null);
    try {
      const res = await fetch(`/api/floorplans/${floorplanId}/versions`, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ note: note.trim(), plan: floorplanToJson(history.present) }),
      });
      const body = (await res.json()) as { version?: { version: number }; error?: { message: string } };
      if (!res.ok || !body.version) {
        setStatus({ tone: "error", text: body.error?.message ?? `Saving failed (HTTP ${res.status}).` });
        return;
      }
      setStatus({ tone: "ok", text: `Saved as version ${body.version.version}.` });
      setNote("");
      router.push(`/floorplans/${floorplanId}`);
    } catch {
      setStatus({ tone: "error", text: "The server could not be reached; nothing was saved." });
    } finally {
      setSaving(false);
    }
  };

  const cursor = tool === "pan" || spaceHeld ? "grab" : "crosshair";
  return (
    <section aria-label="Tile editor" className="space-y-3">
      <div className="flex flex-wrap items-center gap-3 text-sm">
        <div role="group" aria-label="Tool" className="flex overflow-hidden rounded-md border border-ink-700">
          {TOOLS.map((t) => (
            <button
              key={t.tool}
              type="button"
              aria-pressed={tool === t.tool}
              title={`${t.label} (${t.key.toUpperCase()})`}
              onClick={() => setTool(t.tool)}
              className={clsx("px-2.5 py-1", tool === t.tool ? "bg-ink-800 text-tide" : "text-ink-300 hover:bg-ink-800/60")}
            >
              {t.label}
            </button>
          ))}
        </div>
        <div role="group" aria-label="Brush" className="flex overflow-hidden rounded-md border border-ink-700">
          {BRUSHES.map((b) => (
            <button
              key={b.kind}
              type="button"
              aria-pressed={brushKind === b.kind}
              title={`${b.label} (${b.key})`}
              onClick={() => setBrushKind(b.kind)}
              className={clsx("px-2.5 py-1", brushKind === b.kind ? "bg-ink-800 text-tide" : "text-ink-300 hover:bg-ink-800/60")}
            >
              {b.label}
            </button>
          ))}
        </div>
        <label className="flex items-center gap-1.5 text-ink-300">
          Mark class
          <select
            value={markClass}
            onChange={(e) => {
              setMarkClass(Number(e.target.value));
              setBrushKind("mark");
            }}
            className="rounded border border-ink-700 bg-ink-800 px-1.5 py-0.5"
          >
            {[1, 2, 3, 4, 5, 6, 7, 8, 9].map((c) => (
              <option key={c} value={c}>
                {c}
              </option>
            ))}
          </select>
        </label>
        <div className="flex gap-1">
          <button type="button" onClick={undo} disabled={history.past.length === 0} className="rounded-md border border-ink-700 px-2.5 py-1 text-ink-300 disabled:opacity-40" title="Undo (Ctrl+Z)">
            Undo
          </button>
          <button type="button" onClick={redo} disabled={history.future.length === 0} className="rounded-md border border-ink-700 px-2.5 py-1 text-ink-300 disabled:opacity-40" title="Redo (Ctrl+Shift+Z)">
            Redo
          </button>
        </div>
        <div className="flex gap-1">
          <button type="button" aria-label="Zoom in" onClick={() => shownView && setView(zoomAt(shownView, 1.25, canvasWidth / 2, CANVAS_HEIGHT / 2))} className="rounded-md border border-ink-700 px-2 py-1 text-ink-300">
            +
          </button>
          <button type="button" aria-label="Zoom out" onClick={() => shownView && setView(zoomAt(shownView, 0.8, canvasWidth / 2, CANVAS_HEIGHT / 2))} className="rounded-md border border-ink-700 px-2 py-1 text-ink-300">
            −
          </button>
          <button type="button" onClick={() => setView(null)} className="rounded-md border border-ink-700 px-2 py-1 text-ink-300">
            Fit
          </button>
        </div>
        <span className="ml-auto font-mono text-xs text-ink-500" data-testid="editor-hover">
          {hover ? `row ${hover.row}, col ${hover.col}` : `${plan.rows} × ${plan.cols}`}
        </span>
      </div>
      <TileCanvas
        plan={plan}
        view={shownView}
        pendingRect={pendingRect}
        heightPx={CANVAS_HEIGHT}
        label={`Editable floorplan, ${plan.rows} rows by ${plan.cols} columns`}
        cursor={cursor}
        onSize={onSize}
        onPointerDown={onPointerDown}
        onPointerMove={onPointerMove}
        onPointerUp={onPointerUp}
        onWheelZoom={(factor, x, y) => shownView && setView(zoomAt(shownView, factor, x, y))}
      />
      <div className="flex flex-wrap items-end gap-4 text-sm">
        <fieldset className="flex items-end gap-2">
          <legend className="mb-1 text-ink-500">Size</legend>
          <label className="flex flex-col gap-1">
            <span className="text-xs text-ink-500">Rows</span>
            <input type="number" min={1} max={FLOORPLAN_MAX_SIDE} value={size.rows} onChange={(e) => setSize((s) => ({ ...s, rows: e.target.value }))} className="w-20 rounded border border-ink-700 bg-ink-800 px-2 py-1 font-mono" />
          </label>
          <label className="flex flex-col gap-1">
            <span className="text-xs text-ink-500">Columns</span>
            <input type="number" min={1} max={FLOORPLAN_MAX_SIDE} value={size.cols} onChange={(e) => setSize((s) => ({ ...s, cols: e.target.value }))} className="w-20 rounded border border-ink-700 bg-ink-800 px-2 py-1 font-mono" />
          </label>
          <button type="button" onClick={applyResize} className="rounded-md border border-ink-700 px-2.5 py-1 text-ink-300">
            Resize
          </button>
        </fieldset>
        <label className="flex min-w-64 flex-1 flex-col gap-1">
          <span className="text-ink-500">Change note</span>
          <input value={note} maxLength={500} onChange={(e) => setNote(e.target.value)} placeholder="What changed, and why" className="rounded border border-ink-700 bg-ink-800 px-2 py-1" />
        </label>
        <button type="button" onClick={save} disabled={saving || !dirty} className="rounded-md border border-tide/60 bg-tide/10 px-3 py-1 text-tide disabled:opacity-40">
          {saving ? "Saving…" : `Save as version ${latestVersion + 1}`}
        </button>
      </div>
      {status && (
        <p role={status.tone === "error" ? "alert" : "status"} className={clsx("text-sm", status.tone === "error" ? "text-coral" : "text-tide")}>
          {status.text}
        </p>
      )}
      <p className="text-xs text-ink-500">
        Drag to paint; Rectangle fills from corner to corner; hold Space or the middle button to pan; the wheel zooms. Keys: P, R, H for the tools, 1–5 for the brushes, Ctrl+Z / Ctrl+Shift+Z.
        Saving makes a new version: robots idle on this floorplan move to it, a robot under way keeps its version until its mission ends.
      </p>
    </section>
  );
}
