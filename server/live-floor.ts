/** What the live floor page renders first: the floorplan, every robot on it, recent alerts. */
import { desc, eq } from "drizzle-orm";
import { alerts, users } from "../db/schema";
import { defaultFloorplanId, latestVersion, listFloorplans, planFromVersion, versionById } from "../db/queries/floorplans";
import type { Db } from "../db/client";
import type { AlertFrame, FloorplanView, LiveFloorSnapshot, RobotFrame } from "../lib/protocol";
import { floorplans, robots } from "../db/schema";
import { appDb } from "./db";
import { TesseraError } from "./errors";
import { registry, runningFleet } from "./registry";

/** A floorplan at its latest version, or at `versionId` (the version a mission pinned). */
export async function floorplanView(floorplanId: number, versionId?: number): Promise<FloorplanView> {
  const db = appDb();
  const row = (await db.select().from(floorplans).where(eq(floorplans.id, floorplanId)).limit(1))[0];
  const version = row ? (versionId !== undefined ? await versionById(db, versionId) : await latestVersion(db, floorplanId)) : undefined;
  if (!row || !version || version.floorplanId !== row.id) throw new TesseraError("not_found", "floorplan", `There is no floorplan ${floorplanId}${versionId !== undefined ? ` version ${versionId}` : ""}.`);
  const plan = planFromVersion(version);
  return {
    id: row.id,
    name: row.name,
    versionId: version.id,
    version: version.version,
    rows: plan.rows,
    cols: plan.cols,
    tileM: plan.tileM,
    blocked: Array.from(plan.blocked),
    mark: Array.from(plan.mark),
    dock: Array.from(plan.dock),
    nogo: Array.from(plan.nogo),
  };
}

export async function liveFloorSnapshot(floorplanId?: number): Promise<LiveFloorSnapshot> {
  const db = appDb();
  const id = floorplanId ?? (await defaultFloorplanId(db));
  if (id === undefined) throw new TesseraError("not_found", "floorplan", "No floorplan exists yet; an admin can create one under Floorplans.");
  const floorplan = await floorplanView(id);
  const fleet = runningFleet();
  const floorFrames = registry().floorFrames;
  return {
    floorplan,
    floorplans: await listFloorplans(db),
    robots: floorFrames ? await floorFrames(id) : fleet.frames(id),
    alerts: await recentAlerts(db),
  };
}

/**
 * A robot's frame right after a command: from this node's fleet, or, when several nodes share
 * the fleet and another one serves the robot, from that node.
 */
export async function robotFrameNow(robotId: string): Promise<RobotFrame> {
  const fleet = runningFleet();
  const runtime = fleet.robots.get(robotId);
  if (runtime) return fleet.frame(runtime);
  const floorFrames = registry().floorFrames;
  const row = (await appDb().select({ floorplanId: robots.floorplanId }).from(robots).where(eq(robots.id, robotId)).limit(1))[0];
  const floorplanId = row ? (row.floorplanId ?? (await defaultFloorplanId(appDb()))) : undefined;
  const frame = floorFrames && floorplanId !== undefined ? (await floorFrames(floorplanId)).find((f) => f.robotId === robotId) : undefined;
  if (!frame) throw new TesseraError("not_found", "robot", `There is no active robot ${robotId}.`);
  return frame;
}

/** The newest alerts with who acknowledged them, newest first. */
export async function recentAlerts(db: Db, limit = 50): Promise<AlertFrame[]> {
  const recent = await db.select({ alert: alerts, ackName: users.name }).from(alerts).leftJoin(users, eq(users.id, alerts.ackBy)).orderBy(desc(alerts.id)).limit(limit);
  return recent.map(({ alert, ackName }) => ({
    id: alert.id,
    robotId: alert.robotId,
    kind: alert.kind,
    message: alert.message,
    createdAt: alert.createdAt.getTime(),
    ackBy: ackName,
    ackAt: alert.ackAt ? alert.ackAt.getTime() : null,
  }));
}
