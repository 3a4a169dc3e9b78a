/** The /robot namespace: robots sign in with their key; the message traffic is the fleet service's. */
import type { Server } from "socket.io";
import type { Db } from "../../db/client";
import { logger } from "../logger";
import { checkRobotHandshake, handshakeError, type RobotSocket } from "./handshake";

export function attachRobotLink(io: Server, db: Db): void {
  const nsp = io.of("/robot");
  nsp.use(async (socket, next) => {
    try {
      const result = await checkRobotHandshake(db, socket.handshake.auth);
      if (!result.ok) {
        logger.info({ code: result.code, address: socket.handshake.address }, "robot handshake refused");
        next(handshakeError(result.code));
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
    logger.info({ robot: robot?.id }, "robot connected");
    socket.on("disconnect", (reason) => logger.info({ robot: robot?.id, reason }, "robot disconnected"));
  });
}
