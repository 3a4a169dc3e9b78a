/** The /robot namespace of PROTOCOL.md: sign-in, then every event handed to the fleet service. */
import type { Server } from "socket.io";
import type { Db } from "../../db/client";
import { ROBOT_EVENT_NAMES } from "../../lib/protocol";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import { checkRobotHandshake, handshakeError, type RobotSocket } from "./handshake";

/**
 * `claim`, when several nodes share the fleet, makes this node the robot's owner before its
 * link is accepted; a claim that fails refuses the handshake with `internal`, which the
 * robot retries.
 */
export function attachRobotLink(io: Server, db: Db, fleet?: Fleet, claim?: (robotId: string) => Promise<void>): void {
  const nsp = io.of("/robot");
  nsp.use(async (socket, next) => {
    try {
      const result = await checkRobotHandshake(db, socket.handshake.auth);
      if (!result.ok) {
        logger.info({ code: result.code, address: socket.handshake.address }, "robot handshake refused");
        next(handshakeError(result.code));
        return;
      }
      if (claim) await claim(result.robot.id);
      if (fleet && !fleet.config.replaceConnections && fleet.isConnected(result.robot.id)) {
        next(handshakeError("already_connected"));
        return;
      }
      (socket as RobotSocket).data.robot = result.robot;
      next();
    } catch (err) {
      logger.error({ err }, "robot handshake failed");
      next(Object.assign(new Error("internal"), { data: { code: "internal" } }));
    }
  });
  nsp.on("connection", (socket) => {
    const robot = (socket as RobotSocket).data.robot;
    if (!robot) return;
    logger.info({ robot: robot.id }, "robot connected");
    if (!fleet) return;
    fleet.attach(robot.id, socket);
    for (const name of ROBOT_EVENT_NAMES) {
      socket.on(name, (payload: unknown, ack?: unknown) => {
        if (typeof ack !== "function") return;
        fleet.receive(robot.id, name, payload, ack as (a: unknown) => void);
      });
    }
    socket.onAny((event: string, ...args: unknown[]) => {
      if ((ROBOT_EVENT_NAMES as string[]).includes(event)) return;
      const ack = args[args.length - 1];
      if (typeof ack === "function") fleet.receive(robot.id, event, args[0], ack as (a: unknown) => void);
    });
    socket.on("disconnect", (reason) => {
      fleet.detach(robot.id, socket);
      logger.info({ robot: robot.id, reason }, "robot disconnected");
    });
  });
}
