/**
 * The /ops socket for one live floor page: joins the floorplan's room, feeds frames into
 * the floor store and resyncs after every reconnect. Commands go to the HTTP routes
 * (use-rest-commands.ts).
 */
"use client";

import { useEffect } from "react";
import { io, type Socket } from "socket.io-client";
import { AlertFrameSchema, FloorplanVersionFrameSchema, OPS_EVENTS, RobotFrameSchema, type AlertFrame, type OpsAck, type RobotFrame } from "@/lib/protocol/ops-feed";
import { beliefFromWire } from "./belief";
import type { FloorStore } from "./store";

/** How long joining a floorplan's room waits for its acknowledgement, in ms. */
const WATCH_TIMEOUT_MS = 8000;

/** The robots (and, if sent, alerts) in a watch acknowledgement, validated; null when it carries none. */
function resyncOf(data: unknown): { robots: RobotFrame[]; alerts?: AlertFrame[] } | null {
  if (typeof data !== "object" || data === null) return null;
  const { robots, alerts } = data as { robots?: unknown; alerts?: unknown };
  if (!Array.isArray(robots)) return null;
  const frames = robots.map((r) => RobotFrameSchema.safeParse(r)).flatMap((p) => (p.success ? [p.data] : []));
  const alertFrames = Array.isArray(alerts) ? alerts.map((a) => AlertFrameSchema.safeParse(a)).flatMap((p) => (p.success ? [p.data] : [])) : undefined;
  return { robots: frames, alerts: alertFrames };
}

function refusal(code: string, message: string): OpsAck {
  return { ok: false, error: { code, message } };
}

/** Emits `name` and resolves with the server's acknowledgement, or a timeout/offline refusal. */
function emitWithAck(socket: Socket | null, name: string, payload: unknown): Promise<OpsAck> {
  if (!socket || !socket.connected) return Promise.resolve(refusal("offline:ops", "The live feed is not connected."));
  return new Promise((resolve) => {
    socket.timeout(WATCH_TIMEOUT_MS).emit(name, payload, (err: Error | null, ack: OpsAck | undefined) => {
      if (err) resolve(refusal("timeout:ops", "The server did not answer in time."));
      else if (!ack || typeof ack !== "object" || !("ok" in ack)) resolve(refusal("bad_response:ops", "The server sent an answer the page cannot read."));
      else resolve(ack);
    });
  });
}

/** Connects to /ops for the store's floorplan while mounted. */
export function useOpsSocket(store: FloorStore): void {
  useEffect(() => {
    const floorplanId = store.getState().floorplan.id;
    const socket = io("/ops", { transports: ["websocket"], withCredentials: true });
    const s = () => store.getState();

    const watch = () => {
      void emitWithAck(socket, "watch", { floorplanId }).then((ack) => {
        if (ack.ok) {
          s().setConnection("live");
          const resync = resyncOf(ack.data);
          if (resync) s().applySnapshot(resync);
        } else {
          s().setConnection("refused", ack.error.message);
        }
      });
    };

    socket.on("connect", watch);
    socket.on("disconnect", (reason) => {
      s().setConnection(reason === "io server disconnect" ? "refused" : "reconnecting", reason === "io server disconnect" ? "The server closed the live feed." : null);
      if (reason === "io server disconnect") socket.connect();
    });
    socket.on("connect_error", (err: Error & { data?: { code?: string } }) => {
      const code = err.data?.code;
      s().setConnection(code ? "refused" : "reconnecting", code ? `The live feed refused this session (${code}). Sign in again if it persists.` : null);
    });
    socket.on(OPS_EVENTS.robot, (raw: unknown) => {
      const parsed = RobotFrameSchema.safeParse(raw);
      if (parsed.success) s().upsertRobot(parsed.data);
    });
    socket.on(OPS_EVENTS.belief, (raw: { robotId?: unknown; rows?: unknown; cols?: unknown; scale?: unknown; data?: unknown }) => {
      if (typeof raw?.robotId !== "string" || typeof raw.rows !== "number" || typeof raw.cols !== "number" || typeof raw.scale !== "number") return;
      const { floorplan, robots } = s();
      if (!robots[raw.robotId]) return;
      const view = beliefFromWire({ robotId: raw.robotId, rows: raw.rows, cols: raw.cols, scale: raw.scale, data: raw.data }, floorplan.rows, floorplan.cols);
      if (view) s().putBelief(view);
    });
    socket.on(OPS_EVENTS.alert, (raw: unknown) => {
      const parsed = AlertFrameSchema.safeParse(raw);
      if (parsed.success) s().upsertAlert(parsed.data);
    });
    socket.on(OPS_EVENTS.removed, (raw: { robotId?: unknown }) => {
      if (typeof raw?.robotId === "string") s().removeRobot(raw.robotId);
    });
    socket.on(OPS_EVENTS.floorplan, (raw: unknown) => {
      const parsed = FloorplanVersionFrameSchema.safeParse(raw);
      if (parsed.success) s().noteVersion(parsed.data);
    });
    socket.io.on("reconnect_attempt", () => s().setConnection("reconnecting"));

    return () => {
      socket.removeAllListeners();
      socket.io.removeAllListeners();
      socket.disconnect();
    };
  }, [store]);
}
