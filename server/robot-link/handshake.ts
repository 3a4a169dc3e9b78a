/** Sign-in of the /robot namespace (PROTOCOL.md, "Transport and sign-in"). */
import { eq } from "drizzle-orm";
import type { Socket } from "socket.io";
import { z } from "zod";
import type { Db } from "../../db/client";
import { robots, type Robot } from "../../db/schema";
import type { HandshakeCode } from "../../lib/vocabulary";
import { verifyRobotKey } from "../../db/robot-keys";


const HandshakeAuthSchema = z.object({
  robot: z.string().min(1).max(40),
  key: z.string().min(1).max(200),
});

export type HandshakeResult = { ok: true; robot: Robot } | { ok: false; code: HandshakeCode };

/** Checks a handshake's `auth` against the roster. */
export async function checkRobotHandshake(db: Db, auth: unknown): Promise<HandshakeResult> {
  const parsed = HandshakeAuthSchema.safeParse(auth);
  if (!parsed.success) return { ok: false, code: "bad_key" };
  const rows = await db.select().from(robots).where(eq(robots.id, parsed.data.robot)).limit(1);
  const robot = rows[0];
  if (!robot) return { ok: false, code: "unknown_robot" };
  if (!verifyRobotKey(parsed.data.key, robot.keyHash)) return { ok: false, code: "bad_key" };
  if (robot.retiredAt) return { ok: false, code: "retired" };
  return { ok: true, robot };
}

/** The connect_error a refused robot sees: message and `data.code` both carry the code. */
export function handshakeError(code: HandshakeCode): Error & { data: { code: HandshakeCode } } {
  return Object.assign(new Error(code), { data: { code } });
}

export type RobotSocket = Socket & { data: { robot?: Robot } };
