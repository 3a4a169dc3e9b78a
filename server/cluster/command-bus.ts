/**
 * Requests between nodes over the socket.io Redis adapter's server-side events (each
 * answered through an acknowledgement, with the adapter's request timeout): operator
 * commands go to the node that owns the robot, and a node a robot connected to asks the
 * owner to hand the robot over.
 */
import type { Namespace } from "socket.io";
import { z } from "zod";
import type { OpsCommandName } from "../../lib/protocol";
import { SessionUserSchema, type SessionUser } from "../auth/options";
import { ERROR_STATUS, isTesseraError, TesseraError, type ErrorType } from "../errors";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import { runOnThisNode } from "../ops-feed/commands";
import type { LeaseStore } from "./lease";
import type { Ownership } from "./ownership";

export type RobotCommandName = Exclude<OpsCommandName, "watch" | "ackAlert">;

const CommandRequestSchema = z.object({
  to: z.string(),
  name: z.enum(["dispatch", "cancel", "hold", "release", "relocate", "fault"]),
  payload: z.object({ robotId: z.string() }).passthrough(),
  user: SessionUserSchema,
});

type CommandReply = { node: string; ok: true; data: unknown } | { node: string; ok: false; error: { code: string; message: string; fields?: Record<string, string[]> } } | null;

/** A reply's error as the TesseraError the owner threw, so both surfaces answer exactly as on one node. */
function errorFrom(error: { code: string; message: string; fields?: Record<string, string[]> }): TesseraError {
  const [type, surface] = error.code.split(":");
  const known = (type in ERROR_STATUS ? type : "internal") as ErrorType;
  return new TesseraError(known, surface ?? "command", error.message, { fields: error.fields });
}

/** Every answer of a server-side event; on a timeout, the answers that came (a dead node answers nothing). */
function ask<T>(nsp: Namespace, event: string, arg: unknown): Promise<T[]> {
  return new Promise((resolve) => {
    nsp.serverSideEmit(event, arg, (err: Error | null, responses: T[]) => {
      if (err) logger.warn({ event, err: err.message }, "not every node answered");
      resolve(responses ?? []);
    });
  });
}

export class CommandBus {
  constructor(
    private readonly nsp: Namespace,
    private readonly fleet: Fleet,
    private readonly leases: LeaseStore,
    private readonly ownership: Ownership,
    private readonly timeoutMs: number,
  ) {
    nsp.on("tessera:handover", (robotId: unknown, reply: (ours: boolean) => void) => {
      if (typeof robotId !== "string") return reply(false);
      this.ownership.handOver(robotId).then(reply, (err: unknown) => {
        logger.error({ err, robot: robotId }, "handover failed");
        reply(false);
      });
    });
    nsp.on("tessera:command", (raw: unknown, reply: (r: CommandReply) => void) => {
      const parsed = CommandRequestSchema.safeParse(raw);
      if (!parsed.success || parsed.data.to !== this.ownership.nodeId) return reply(null);
      const { name, payload, user } = parsed.data;
      if (!this.ownership.owns(payload.robotId)) return reply(null);
      const node = this.ownership.nodeId;
      runOnThisNode(this.fleet, name, payload, user).then(
        (data) => reply({ node, ok: true, data }),
        (err: unknown) => {
          if (isTesseraError(err)) return reply({ node, ok: false, error: err.toBody().error });
          logger.error({ err, command: name }, "routed command failed");
          reply({ node, ok: false, error: { code: `internal:${name}`, message: "The command failed on the server; it has been logged." } });
        },
      );
    });
  }

  /** Asks the other nodes to hand a robot over; the owner parks it and gives up its lease before it answers. */
  async askHandover(robotId: string): Promise<void> {
    await ask<boolean>(this.nsp, "tessera:handover", robotId);
  }

  /**
   * Runs a robot command on the robot's owner. A robot nobody owns is taken over here
   * first; an owner that does not answer in time makes the command `unavailable`.
   */
  async run(name: RobotCommandName, payload: { robotId: string }, user: SessionUser): Promise<unknown> {
    for (let attempt = 0; attempt < 2; attempt++) {
      const holder = await this.leases.holder(payload.robotId);
      if (!holder || holder.nodeId === this.ownership.nodeId) {
        await this.ownership.claim(payload.robotId);
        return runOnThisNode(this.fleet, name, payload, user);
      }
      const replies = await ask<CommandReply>(this.nsp, "tessera:command", { to: holder.nodeId, name, payload, user });
      const reply = replies.find((r) => r?.node === holder.nodeId);
      if (reply?.ok) return reply.data;
      if (reply) throw errorFrom(reply.error);
      // No answer: the owner is dead (its lease will expire) or handed the robot on meanwhile; look once more.
    }
    throw new TesseraError("unavailable", name, `The node serving robot ${payload.robotId} did not answer within ${this.timeoutMs} ms; try again.`);
  }
}
