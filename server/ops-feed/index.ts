/** The /ops namespace for dashboards; live frames come with the fleet service. */
import type { Server } from "socket.io";
import { config, publicUrl } from "../config";
import { logger } from "../logger";
import type { SessionUser } from "../auth/options";
import { checkOpsHandshake } from "./handshake";

export function allowedOrigins(): string[] {
  const c = config();
  const origins = new Set([publicUrl(), `http://127.0.0.1:${c.PORT}`, `http://localhost:${c.PORT}`]);
  return [...origins];
}

export function attachOpsFeed(io: Server): void {
  const nsp = io.of("/ops");
  nsp.use(async (socket, next) => {
    const result = await checkOpsHandshake(socket.handshake.headers, { secret: config().NEXTAUTH_SECRET, allowedOrigins: allowedOrigins() });
    if (!result.ok) {
      next(Object.assign(new Error(result.code), { data: { code: result.code } }));
      return;
    }
    (socket.data as { user?: SessionUser }).user = result.user;
    next();
  });
  nsp.on("connection", (socket) => {
    const user = (socket.data as { user?: SessionUser }).user;
    logger.debug({ user: user?.email }, "dashboard connected");
    socket.emit("welcome", { user: { name: user?.name, role: user?.role } });
  });
}
