/**
 * The /ops namespace for dashboards: robot frames, throttled belief frames and alerts to
 * the room of each floorplan, and commands through the same role checks and fleet
 * functions as the HTTP routes.
 */
import type { Server, Socket } from "socket.io";
import { OPS_EVENTS, OpsCommandSchemas, quantiseMarginal, type BeliefFrame, type OpsAck, type OpsCommandName, type RobotFrame } from "../../lib/protocol";
import { roleAllows } from "../../lib/roles";
import type { Role } from "../../lib/vocabulary";
import type { SessionUser } from "../auth/options";
import { config, publicUrl } from "../config";
import { isTesseraError, TesseraError, zodFields } from "../errors";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import { checkOpsHandshake } from "./handshake";
import { recentAlerts } from "../live-floor";
import { runCommand } from "./commands";

export function allowedOrigins(): string[] {
  const c = config();
  const origins = new Set([publicUrl(), `http://127.0.0.1:${c.PORT}`, `http://localhost:${c.PORT}`]);
  return [...origins];
}

const room = (floorplanId: number | null) => `floorplan:${floorplanId ?? "none"}`;

/** Least role for each /ops command. */
export const OPS_COMMAND_ROLES: Record<OpsCommandName, Role> = {
  watch: "viewer",
  dispatch: "operator",
  cancel: "operator",
  hold: "operator",
  release: "operator",
  relocate: "operator",
  ackAlert: "operator",
  fault: "admin",
};

/** `floor`, when several nodes share the fleet, answers `watch` with every node's robots. */
export function attachOpsFeed(io: Server, fleet?: Fleet, floor?: (floorplanId: number) => Promise<{ robots: RobotFrame[]; beliefs: BeliefFrame[] }>): void {
  const nsp = io.of("/ops");
  nsp.use(async (socket, next) => {
    let result: Awaited<ReturnType<typeof checkOpsHandshake>>;
    try {
      result = await checkOpsHandshake(socket.handshake.headers, { secret: config().NEXTAUTH_SECRET, allowedOrigins: allowedOrigins() });
    } catch (err) {
      // The user lookup needs MariaDB; without it the dashboard is refused and retries, the server stays up.
      logger.error({ err }, "dashboard handshake failed");
      next(Object.assign(new Error("internal"), { data: { code: "internal" } }));
      return;
    }
    if (!result.ok) {
      next(Object.assign(new Error(result.code), { data: { code: result.code } }));
      return;
    }
    (socket.data as { user?: SessionUser }).user = result.user;
    next();
  });

  nsp.on("connection", (socket: Socket) => {
    const user = (socket.data as { user: SessionUser }).user;
    socket.emit("welcome", { user: { name: user.name, role: user.role } });
    for (const name of Object.keys(OpsCommandSchemas) as OpsCommandName[]) {
      socket.on(name, async (payload: unknown, ack?: unknown) => {
        const reply = typeof ack === "function" ? (ack as (a: OpsAck) => void) : () => {};
        try {
          if (!roleAllows(user.role, OPS_COMMAND_ROLES[name])) {
            throw new TesseraError("forbidden", name, `${name} needs the ${OPS_COMMAND_ROLES[name]} role; you are ${user.role}.`);
          }
          const parsed = OpsCommandSchemas[name].safeParse(payload);
          if (!parsed.success) throw new TesseraError("bad_request", name, `The ${name} command is not valid.`, { fields: zodFields(parsed.error) });
          if (!fleet) throw new TesseraError("unavailable", name, "The fleet service is not running.");
          if (name === "watch") {
            for (const r of socket.rooms) if (r.startsWith("floorplan:")) void socket.leave(r);
            const floorplanId = (parsed.data as { floorplanId: number }).floorplanId;
            await socket.join(room(floorplanId));
            if (floor) {
              const view = await floor(floorplanId);
              for (const b of view.beliefs) socket.emit(OPS_EVENTS.belief, b);
              reply({ ok: true, data: { robots: view.robots, alerts: await recentAlerts(fleet.db) } });
              return;
            }
            const frames = fleet.frames(floorplanId);
            for (const frame of frames) {
              const m = fleet.marginal(frame.robotId);
              if (m) socket.emit(OPS_EVENTS.belief, toBeliefFrame(frame.robotId, m));
            }
            reply({ ok: true, data: { robots: frames, alerts: await recentAlerts(fleet.db) } });
            return;
          }
          const data = await runCommand(fleet, name, parsed.data, user);
          reply({ ok: true, data });
        } catch (err) {
          if (isTesseraError(err)) reply({ ok: false, error: err.toBody().error });
          else {
            logger.error({ err, command: name }, "ops command failed");
            reply({ ok: false, error: { code: `internal:${name}`, message: "The command failed on the server; it has been logged." } });
          }
        }
      });
    }
  });

  if (!fleet) return;
  fleet.on("robot", (frame) => nsp.to(room(frame.floorplanId)).emit(OPS_EVENTS.robot, frame));
  fleet.on("removed", (gone) => nsp.to(room(gone.floorplanId)).emit(OPS_EVENTS.removed, { robotId: gone.robotId }));
  fleet.on("floorplan", (frame) => nsp.to(room(frame.floorplanId)).emit(OPS_EVENTS.floorplan, frame));
  fleet.on("alert", (alert) =>
    nsp.to(room(alert.floorplanId)).emit(OPS_EVENTS.alert, { id: alert.id, robotId: alert.robotId, kind: alert.kind, message: alert.message, createdAt: alert.createdAt, ackBy: null, ackAt: null }),
  );
  const lastSent = new Map<string, number>();
  const pending = new Map<string, NodeJS.Timeout>();
  const minGapMs = 1000 / fleet.config.beliefFrameHz;
  fleet.on("belief", (b) => {
    const send = () => {
      pending.delete(b.robotId);
      lastSent.set(b.robotId, Date.now());
      const latest = fleet.marginal(b.robotId);
      if (latest) nsp.to(room(b.floorplanId)).emit(OPS_EVENTS.belief, toBeliefFrame(b.robotId, latest));
    };
    const wait = (lastSent.get(b.robotId) ?? 0) + minGapMs - Date.now();
    if (wait <= 0) send();
    else if (!pending.has(b.robotId)) pending.set(b.robotId, setTimeout(send, wait));
  });
}

function toBeliefFrame(robotId: string, m: { rows: number; cols: number; marginal: Float32Array }): BeliefFrame {
  const q = quantiseMarginal(m.marginal);
  return { robotId, rows: m.rows, cols: m.cols, scale: q.scale, data: q.data };
}
