/**
 * One Tessera node among several sharing the fleet through Redis (README, "Growing past
 * one machine"): robot leases with fencing, dashboard fan-out over the socket.io Redis
 * adapter, and commands routed to the robot's owner. Only started when REDIS_URL is set.
 */
import type { Server } from "socket.io";
import type { Db } from "../../db/client";
import type { ClusterConfig } from "../config";
import type { Fleet } from "../fleet/fleet";
import { logger } from "../logger";
import { CommandBus } from "./command-bus";
import { FleetView } from "./fleet-view";
import { LeaseStore } from "./lease";
import { Ownership } from "./ownership";
import { shareTraffic } from "./traffic-peers";
import { connectRedis } from "./redis";

export interface ClusterNode {
  nodeId: string;
  /** Resolves once this node serves the robot (its link may then be attached). */
  claim(robotId: string): Promise<void>;
  commands: CommandBus;
  view: FleetView;
  /** Gives up every lease after committing what is queued, then leaves Redis. */
  stop(): Promise<void>;
}

/** Namespace of the requests between nodes; no client ever connects to it. */
const CLUSTER_NAMESPACE = "/tessera-nodes";

export async function startClusterNode(io: Server, db: Db, fleet: Fleet, config: ClusterConfig): Promise<ClusterNode> {
  const links = await connectRedis(config.redisUrl, io, config.nodeTimeoutMs);
  const nsp = io.of(CLUSTER_NAMESPACE);
  nsp.use((_socket, next) => next(Object.assign(new Error("not_found"), { data: { code: "not_found" } })));
  const leases = new LeaseStore(links.redis, config.nodeId, config.leaseTtlMs);
  const ownership: Ownership = new Ownership(db, fleet, leases, {
    renewMs: config.leaseRenewMs,
    // A dead owner's lease runs out within one TTL; the handover question may take one request timeout more.
    claimTimeoutMs: config.leaseTtlMs + config.nodeTimeoutMs + config.leaseRenewMs,
    askHandover: (robotId): Promise<void> => bus.askHandover(robotId),
  });
  const bus: CommandBus = new CommandBus(nsp, fleet, leases, ownership, config.nodeTimeoutMs);
  const view = new FleetView(nsp, fleet, ownership);
  shareTraffic(nsp, fleet, ownership);
  ownership.start();
  logger.info({ node: config.nodeId, leaseTtlMs: config.leaseTtlMs }, "node joined the fleet through Redis");
  return {
    nodeId: config.nodeId,
    claim: (robotId) => ownership.claim(robotId),
    commands: bus,
    view,
    async stop() {
      await ownership.stop();
      await links.close();
    },
  };
}
