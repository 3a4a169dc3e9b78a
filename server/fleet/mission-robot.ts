/**
 * The robot behind a logged mission, as replay and the certainty curve need it: the live
 * runtime's models and sensors when the robot is on the live floor, otherwise (retired)
 * those of its roster row, so old missions replay after their robot is gone.
 */
import { eq } from "drizzle-orm";
import { robots } from "../../db/schema";
import { motionModelOf, resolveRobotSettings, sensorModelOf } from "../../lib/roster";
import type { SensorSpec } from "../../lib/sensing";
import { TesseraError } from "../errors";
import type { Fleet } from "./fleet";
import type { Models } from "./models-at";
import type { RobotRuntime } from "./robot-runtime";

export interface MissionRobot {
  /** The models the robot runs with now; replay walks back from them through logged retunings. */
  current: Models;
  sensors: SensorSpec[];
  /** The live runtime, whose filter tables a replay on the same version may share. */
  runtime: RobotRuntime | undefined;
}

export async function missionRobot(fleet: Fleet, robotId: string, surface: string): Promise<MissionRobot> {
  const runtime = fleet.robots.get(robotId);
  if (runtime) return { current: { motion: runtime.motion, sensor: runtime.sensorModel }, sensors: runtime.sensors, runtime };
  const row = (await fleet.db.select().from(robots).where(eq(robots.id, robotId)).limit(1))[0];
  if (!row) throw new TesseraError("not_found", surface, `Robot ${robotId} is not on the roster.`);
  const { settings } = resolveRobotSettings(row.drive, row.settings);
  return { current: { motion: motionModelOf(row.drive, settings), sensor: sensorModelOf(settings) }, sensors: row.sensors as SensorSpec[], runtime: undefined };
}
