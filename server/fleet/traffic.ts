/**
 * The traffic rule for shared tiles: a robot is not sent onto a tile that another robot on
 * the same floorplan version has claimed for its next step, or confidently stands on. The
 * other robots are peers: this process's robots and, with several nodes, the ones other
 * nodes serve, as their frames last described them.
 */
import type { Tile } from "../../lib/floorplan";
import type { RobotFrame } from "../../lib/protocol";
import type { HoldReason } from "../../lib/vocabulary";
import type { RobotRuntime } from "./robot-runtime";
import { missionRoute } from "./route-preview";

export interface TrafficPeer {
  id: string;
  name: string;
  versionId: number;
  hold: HoldReason | null;
  hasMission: boolean;
  /** The tile claimed for the next step. */
  claim: Tile | null;
  /** The most likely tile and its mass, when the robot is online or on a mission (a robot off the link may still stand there mid-mission). */
  standing: { row: number; col: number; tileMass: number } | null;
  /** The tiles its policy would take from its most likely pose, goal last; empty without a mission. */
  readonly route: readonly Tile[];
  /** It is stepping aside for another robot, so waiting for it is not a standoff. */
  givingWay: boolean;
  /** It follows a way round (or aside from) another robot: while it moves, it is clearing the way. */
  detouring: boolean;
}

export function peerOfRuntime(r: RobotRuntime): TrafficPeer {
  const c = r.online || r.mission ? r.certainty() : null;
  return {
    id: r.id,
    name: r.name,
    versionId: r.versionId,
    hold: r.hold,
    hasMission: r.mission !== null,
    claim: r.mission?.claim ?? null,
    standing: c ? { row: c.row, col: c.col, tileMass: c.tileMass } : null,
    // Only a robot that cannot go round this one reads it, so it is worked out on demand.
    get route() {
      return missionRoute(r);
    },
    givingWay: r.mission?.giveWay != null,
    detouring: r.mission?.detour != null,
  };
}

export function peerOfFrame(f: RobotFrame): TrafficPeer | null {
  if (f.versionId === null) return null;
  const standing = (f.online || f.mission) && f.estimate ? { row: f.estimate.row, col: f.estimate.col, tileMass: f.estimate.tileMass } : null;
  const m = f.mission;
  return { id: f.robotId, name: f.name, versionId: f.versionId, hold: f.holdReason, hasMission: m !== null, claim: m?.claim ?? null, standing, route: m?.route ?? [], givingWay: m?.givingWayTo != null, detouring: m?.detouring ?? false };
}

/** The peer that keeps robot `self` (on `versionId`) off `tile`, or null; `trafficMass` is the tile mass that counts as standing there. */
export function trafficBlocker(peers: Iterable<TrafficPeer>, self: string, versionId: number, tile: Tile, trafficMass: number): TrafficPeer | null {
  for (const other of peers) {
    if (other.id === self || other.versionId !== versionId) continue;
    if (other.claim && other.claim.row === tile.row && other.claim.col === tile.col) return other;
    const s = other.standing;
    if (s && s.row === tile.row && s.col === tile.col && s.tileMass >= trafficMass) return other;
  }
  return null;
}

/** The tiles a peer keeps others off: the one it confidently stands on and the one it claims. */
export function occupiedTiles(p: TrafficPeer): Tile[] {
  return [...(p.standing ? [{ row: p.standing.row, col: p.standing.col }] : []), ...(p.claim ? [p.claim] : [])];
}
