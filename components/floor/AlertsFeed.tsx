"use client";

import clsx from "clsx";
import { memo } from "react";
import type { AlertFrame } from "@/lib/protocol/ops-feed";
import { useFloorCommands } from "./commands";
import { Age } from "./bits";
import { ALERT_LABELS, formatClock } from "./format";
import { useFloor } from "./store";

const URGENT = new Set<AlertFrame["kind"]>(["fault", "offline"]);

const AlertItem = memo(function AlertItem({ alert }: { alert: AlertFrame }) {
  const robotName = useFloor((s) => (alert.robotId ? (s.robots[alert.robotId]?.name ?? alert.robotId) : null));
  const select = useFloor((s) => s.select);
  const known = useFloor((s) => (alert.robotId ? Boolean(s.robots[alert.robotId]) : false));
  const commands = useFloorCommands();
  const acked = alert.ackAt !== null;
  const urgent = URGENT.has(alert.kind);
  return (
    <li
      data-testid={`alert-${alert.id}`}
      className={clsx("rounded-md border-l-4 bg-ink-900 px-3 py-2 text-sm", acked ? "border-ink-700 opacity-75" : urgent ? "border-coral" : "border-amberline")}
    >
      <div className="flex items-baseline justify-between gap-2">
        <span className={clsx("text-xs font-semibold uppercase tracking-wide", acked ? "text-ink-500" : urgent ? "text-coral" : "text-amberline")}>{ALERT_LABELS[alert.kind]}</span>
        <span className="flex items-baseline gap-2 text-xs text-ink-500">
          {known && robotName && (
            <button type="button" className="underline decoration-ink-700 underline-offset-2 hover:text-ink-100 hover:decoration-tide" onClick={() => alert.robotId && select(alert.robotId)}>
              Show {robotName}
            </button>
          )}
          <span>
            <Age at={alert.createdAt} staleS={Number.POSITIVE_INFINITY} /> ago
          </span>
        </span>
      </div>
      <p className="mt-0.5 text-ink-100">
        {robotName && !alert.message.startsWith(robotName) && <span className="mr-1 font-semibold">{robotName}:</span>}
        {alert.message}
      </p>
      <div className="mt-1 text-xs">
        {acked ? (
          <span className="text-ink-500">
            Acknowledged by {alert.ackBy ?? "someone"} at {formatClock(alert.ackAt ?? 0)}
          </span>
        ) : commands.canCommand ? (
          <button type="button" onClick={() => void commands.ackAlert(alert.id)} className="rounded border border-ink-700 px-2 py-0.5 text-ink-300 hover:border-ink-500 hover:text-ink-100">
            Acknowledge
          </button>
        ) : (
          <span className="text-ink-500">Not acknowledged yet</span>
        )}
      </div>
    </li>
  );
});

/** Alerts for this floor, newest first; unacknowledged ones carry a coloured edge. */
export function AlertsFeed() {
  const alerts = useFloor((s) => s.alerts);
  const open = alerts.filter((a) => a.ackAt === null).length;
  return (
    <section aria-label="Alerts" className="flex min-h-0 flex-col">
      <h2 className="mb-2 flex items-center gap-2 text-sm font-semibold text-ink-300">
        Alerts
        {open > 0 && <span className="rounded-full bg-coral/20 px-1.5 text-xs text-coral">{open} open</span>}
      </h2>
      {alerts.length === 0 ? (
        <p className="rounded-md border border-dashed border-ink-700 p-3 text-xs text-ink-500">No alerts on this floor. Low certainty, lost links, faults and long traffic waits show up here.</p>
      ) : (
        <ul className="min-h-0 space-y-1.5 overflow-y-auto pr-1" data-testid="alerts-feed">
          {alerts.map((a) => (
            <AlertItem key={a.id} alert={a} />
          ))}
        </ul>
      )}
    </section>
  );
}
