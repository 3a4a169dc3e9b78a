/**
 * The traffic rule for shared tiles: a robot is not sent onto a tile that another robot on
 * the same floorplan version has claimed for its next step, or confidently stands on.
 */
import type { Tile } from "../../lib/floorplan";
import type { RobotRuntime } from "./robot-runtime";

/** The robot that keeps `runtime` off `tile`, or null; `trafficMass` is the tile mass that counts as standing there. */
export function trafficBlocker(robots: Iterable<RobotRuntime>, runtime: RobotRuntime, tile: Tile, trafficMass: number): RobotRuntime | null {
  for (const other of robots) {
    if (other === runtime || other.versionId !== runtime.versionId) continue;
    const claim = other.mission?.claim;
    if (claim && claim.row === tile.row && claim.col === tile.col) return other;
    if (other.online || other.mission) {
      const oc = other.certainty();
      if (oc.row === tile.row && oc.col === tile.col && oc.tileMass >= trafficMass) return other;
    }
  }
  return null;
}
