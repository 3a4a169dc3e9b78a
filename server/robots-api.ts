/** Registering robots: the key is generated here, returned once, and stored only hashed. */
import { randomBytes } from "node:crypto";
import { eq } from "drizzle-orm";
import { defaultFloorplanId } from "../db/queries/floorplans";
import { generateRobotKey, hashRobotKey } from "../db/robot-keys";
import { floorplans, robots } from "../db/schema";
import { RegisterRobotSchema, type RegisterRobotInput } from "../lib/roster";
import { writeAudit } from "./audit/audit";
import { appDb } from "./db";
import { TesseraError } from "./errors";
import type { Actor } from "./fleet/fleet";
import { runningFleet } from "./registry";

export { RegisterRobotSchema };

export async function registerRobot(input: RegisterRobotInput, actor: Actor) {
  const db = appDb();
  const floorplanId = input.floorplanId ?? (await defaultFloorplanId(db));
  if (floorplanId === undefined) throw new TesseraError("unprocessable", "robots", "There is no floorplan to put the robot on; create one first.");
  if (input.floorplanId !== undefined) {
    const exists = await db.select({ id: floorplans.id }).from(floorplans).where(eq(floorplans.id, input.floorplanId)).limit(1);
    if (!exists.length) throw new TesseraError("unprocessable", "robots", `There is no floorplan ${input.floorplanId}.`, { fields: { floorplanId: ["unknown floorplan"] } });
  }
  const id = `rb-${randomBytes(5).toString("hex")}`;
  const key = generateRobotKey();
  await db.insert(robots).values({
    id,
    name: input.name,
    keyHash: hashRobotKey(key),
    drive: input.drive,
    sensors: input.sensors,
    simulated: input.simulated ?? false,
    floorplanId,
  });
  const row = (await db.select().from(robots).where(eq(robots.id, id)).limit(1))[0];
  await runningFleet().register(row);
  await writeAudit(db, actor.userId, "register", id, { name: row.name, drive: row.drive, floorplanId, simulated: row.simulated });
  return { robot: { id, name: row.name, drive: row.drive, sensors: row.sensors, floorplanId, simulated: row.simulated }, key };
}
