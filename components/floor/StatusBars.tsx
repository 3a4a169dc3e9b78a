"use client";

import clsx from "clsx";
import { useEffect } from "react";
import { useFloor, useFloorStore } from "./store";

/** A banner while the live feed is not connected, so stale positions never pass for live ones. */
export function ConnectionBanner() {
  const connection = useFloor((s) => s.connection);
  const detail = useFloor((s) => s.connectionDetail);
  if (connection === "live") return null;
  const text =
    connection === "connecting"
      ? "Connecting to the live feed…"
      : connection === "reconnecting"
        ? "Live feed lost. Reconnecting… Robots are shown where they were last reported."
        : (detail ?? "The live feed refused this page.");
  return (
    <div
      role="status"
      data-testid="connection-banner"
      data-connection={connection}
      className={clsx(
        "flex items-center gap-2 rounded-md border px-3 py-1.5 text-sm",
        connection === "refused" ? "border-coral/60 bg-coral/10 text-coral" : connection === "reconnecting" ? "border-amberline/60 bg-amberline/10 text-amberline" : "border-ink-700 bg-ink-900 text-ink-300",
      )}
    >
      {connection !== "refused" && <span aria-hidden className="inline-block size-2 animate-pulse rounded-full bg-current" />}
      {text}
    </div>
  );
}

/** Offers the floorplan's newer version; reloading is the operator's choice, never a surprise mid-command. */
export function NewerVersionBar() {
  const newer = useFloor((s) => s.newerVersion);
  if (!newer) return null;
  return (
    <div role="status" data-testid="newer-version" className="flex flex-wrap items-center justify-between gap-2 rounded-md border border-tide/50 bg-tide/10 px-3 py-1.5 text-sm text-tide">
      <span>Version {newer.version} of this floorplan was saved. Idle robots use it now; robots on a mission finish on the version they started on.</span>
      <button type="button" onClick={() => window.location.reload()} className="rounded border border-tide/60 px-2 py-0.5 hover:bg-tide/20">
        Show version {newer.version}
      </button>
    </div>
  );
}

/** A small pill with the feed state, for the toolbar. */
export function ConnectionPill() {
  const connection = useFloor((s) => s.connection);
  const words = { connecting: "connecting", live: "live", reconnecting: "reconnecting", refused: "refused" }[connection];
  return (
    <span data-testid="connection-state" data-connection={connection} className="inline-flex items-center gap-1.5 text-xs text-ink-300">
      <span aria-hidden className={clsx("inline-block size-2 rounded-full", connection === "live" ? "bg-tide" : connection === "refused" ? "bg-coral" : "animate-pulse bg-amberline")} />
      {words}
    </span>
  );
}

/** The result of the last command; refusals stay until dismissed, confirmations fade after a few seconds. */
export function NoticeBar() {
  const store = useFloorStore();
  const notice = useFloor((s) => s.notice);
  useEffect(() => {
    if (!notice || notice.tone === "error") return;
    const timer = setTimeout(() => {
      if (store.getState().notice === notice) store.getState().clearNotice();
    }, 5000);
    return () => clearTimeout(timer);
  }, [notice, store]);
  if (!notice) return <div aria-live="polite" className="sr-only" />;
  const error = notice.tone === "error";
  return (
    <div
      role={error ? "alert" : "status"}
      data-testid="floor-notice"
      data-tone={notice.tone}
      className={clsx("flex items-start justify-between gap-3 rounded-md border px-3 py-2 text-sm", error ? "border-coral/60 bg-coral/10 text-coral" : "border-tide/50 bg-tide/10 text-tide")}
    >
      <span>{notice.text}</span>
      <button type="button" aria-label="Dismiss" onClick={() => store.getState().clearNotice()} className="text-ink-300 hover:text-ink-100">
        ×
      </button>
    </div>
  );
}
