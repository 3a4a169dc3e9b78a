/**
 * Demo data of Tessera's own invented site, the North Annex lab. Idempotent: running it
 * again leaves existing rows (and anything users changed) alone.
 */
import { readFileSync } from "node:fs";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { parseFloorplan } from "../lib/floorplan";
import type { SensorSpec } from "../lib/sensing";
import type { Drive, Heading, Role } from "../lib/vocabulary";
import type { Db } from "./client";
import { createFloorplan, floorplanByName } from "./queries/floorplans";
import { generateRobotKey, hashRobotKey, verifyRobotKey } from "./robot-keys";
import { robots, users } from "./schema";

export const DEMO_USERS: readonly { email: string; name: string; role: Role }[] = [
  { email: "admin@tessera.test", name: "Ada Okafor", role: "admin" },
  { email: "operator@tessera.test", name: "Tomás Reyes", role: "operator" },
  { email: "viewer@tessera.test", name: "Mei Lindqvist", role: "viewer" },
];

export const DEMO_FLOORPLAN_NAME = "North Annex lab";
export const DEMO_FLOORPLAN_FILE = new URL("./seed-data/demo-lab.txt", import.meta.url);

/** Front, left and right ultrasonic rangers (3 m) and a downward floor-mark sensor. */
export const DEMO_SENSORS: SensorSpec[] = [
  { id: "us-front", kind: "range", bearingDeg: 0, maxRangeM: 3 },
  { id: "us-left", kind: "range", bearingDeg: 90, maxRangeM: 3 },
  { id: "us-right", kind: "range", bearingDeg: -90, maxRangeM: 3 },
  { id: "floor", kind: "floor" },
];

export interface DemoRobot {
  id: string;
  name: string;
  drive: Drive;
  sensors: SensorSpec[];
  start: { row: number; col: number; heading: Heading };
}

export const DEMO_ROBOTS: readonly DemoRobot[] = [
  { id: "nx-kestrel", name: "Kestrel", drive: "differential", sensors: DEMO_SENSORS, start: { row: 2, col: 3, heading: "E" } },
  { id: "nx-otter", name: "Otter", drive: "differential", sensors: DEMO_SENSORS, start: { row: 10, col: 12, heading: "W" } },
  { id: "nx-magpie", name: "Magpie", drive: "differential", sensors: DEMO_SENSORS, start: { row: 7, col: 24, heading: "N" } },
  // Differential like the others: a bicycle-drive robot that faces a wall has no action that frees it
  // (the link has no reverse), so in an unattended demo it would sit stuck once it got there.
  { id: "nx-badger", name: "Badger", drive: "differential", sensors: DEMO_SENSORS, start: { row: 16, col: 20, heading: "S" } },
];

export interface DemoFleetCredentials {
  robots: (DemoRobot & { key: string })[];
}

/** Seeds the demo accounts; `onCall` names those who receive alert e-mails from the start. */
export async function seedDemoUsers(db: Db, opts: { demoPassword: string; onCall?: readonly string[] }): Promise<void> {
  const passwordHash = await bcrypt.hash(opts.demoPassword, 10);
  for (const user of DEMO_USERS) {
    await db.insert(users).ignore().values({ ...user, passwordHash, onCall: opts.onCall?.includes(user.email) ?? false });
  }
}

/** The demo floorplan's id, created on first run. */
export async function seedDemoFloorplan(db: Db): Promise<number> {
  const existing = await floorplanByName(db, DEMO_FLOORPLAN_NAME);
  if (existing) return existing.id;
  const plan = parseFloorplan(readFileSync(DEMO_FLOORPLAN_FILE, "utf8"));
  const { floorplanId } = await createFloorplan(db, { name: DEMO_FLOORPLAN_NAME, plan, isDefault: true, note: "Demo floor, as drawn" });
  return floorplanId;
}

/**
 * Registers the demo robots. Keys are only stored hashed, so the simulators' keys come
 * from `known` (the credentials file of an earlier run); a robot whose key is not known
 * gets a fresh one.
 */
export async function seedDemoFleet(db: Db, floorplanId: number, known: Record<string, string> = {}): Promise<DemoFleetCredentials> {
  const out: DemoFleetCredentials = { robots: [] };
  for (const robot of DEMO_ROBOTS) {
    const rows = await db.select().from(robots).where(eq(robots.id, robot.id)).limit(1);
    const row = rows[0];
    const knownKey = known[robot.id];
    if (row && knownKey && verifyRobotKey(knownKey, row.keyHash)) {
      out.robots.push({ ...robot, key: knownKey });
      continue;
    }
    const key = generateRobotKey();
    if (row) {
      await db.update(robots).set({ keyHash: hashRobotKey(key) }).where(eq(robots.id, robot.id));
    } else {
      await db.insert(robots).values({
        id: robot.id,
        name: robot.name,
        keyHash: hashRobotKey(key),
        drive: robot.drive,
        model: "Annex two-wheel base",
        sensors: robot.sensors,
        simulated: true,
        floorplanId,
      });
    }
    out.robots.push({ ...robot, key });
  }
  return out;
}
