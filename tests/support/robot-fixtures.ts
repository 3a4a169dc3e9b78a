/** Registers robots straight in the database for tests that need one to sign in. */
import { randomUUID } from "node:crypto";
import type { Db } from "../../db/client";
import { robots } from "../../db/schema";
import { generateRobotKey, hashRobotKey } from "../../db/robot-keys";

export async function insertTestRobot(db: Db, overrides: { retired?: boolean; simulated?: boolean } = {}) {
  const id = `rb-${randomUUID().slice(0, 8)}`;
  const key = generateRobotKey();
  await db.insert(robots).values({
    id,
    name: `Test ${id}`,
    keyHash: hashRobotKey(key),
    drive: "differential",
    sensors: [],
    simulated: overrides.simulated ?? true,
    retiredAt: overrides.retired ? new Date() : null,
  });
  return { id, key };
}
