/**
 * The roster: robots as the roster pages and routes see them (never a key or its hash),
 * key rotation, retirement and per-robot tuning. Every change is written to the audit
 * table and applied to the running fleet at once.
 */
import { isDeepStrictEqual } from "node:util";
import { and, desc, eq, isNull } from "drizzle-orm";
import type { Db } from "../db/client";
import { listFloorplans } from "../db/queries/floorplans";
import { generateRobotKey, hashRobotKey } from "../db/robot-keys";
import { beliefs, missions, robots, type Robot } from "../db/schema";
import {
  defaultRobotSettings,
  resolveRobotSettings,
  RobotSettingsSchema,
  type RobotDetailView,
  type RobotSettings,
  type RosterEntry,
  type SettingsView,
} from "../lib/roster";
import type { SensorSpec } from "../lib/sensing";
import { writeAudit } from "./audit/audit";
import { appDb } from "./db";
import { TesseraError, zodFields } from "./errors";
import { missionSummary } from "./logbook";
import type { Actor } from "./fleet/fleet";
import { runningFleet } from "./registry";

/** Certainty points the robot page charts. */
const CERTAINTY_POINTS = 120;
/** Missions the robot page lists. */
const MISSIONS_SHOWN = 25;

/** The columns a roster answer may carry: everything but the key hash. */
const PUBLIC_COLUMNS = {
  id: robots.id,
  name: robots.name,
  drive: robots.drive,
  model: robots.model,
  sensors: robots.sensors,
  simulated: robots.simulated,
  floorplanId: robots.floorplanId,
  retiredAt: robots.retiredAt,
  createdAt: robots.createdAt,
};

type PublicRobot = Omit<Robot, "keyHash" | "settings" | "fence">;

function liveFrame(robotId: string) {
  const fleet = runningFleet();
  const runtime = fleet.robots.get(robotId);
  return runtime ? fleet.frame(runtime) : null;
}

function rosterEntry(row: PublicRobot, floorplanNames: Map<number, string>): RosterEntry {
  const frame = liveFrame(row.id);
  return {
    id: row.id,
    name: row.name,
    drive: row.drive,
    model: row.model,
    sensors: row.sensors as SensorSpec[],
    simulated: row.simulated,
    floorplanId: row.floorplanId,
    floorplanName: row.floorplanId === null ? null : (floorplanNames.get(row.floorplanId) ?? null),
    online: frame?.online ?? false,
    state: frame?.state ?? "offline",
    lastSeenAt: frame?.lastMessageAt ?? null,
    retiredAt: row.retiredAt?.getTime() ?? null,
    createdAt: row.createdAt.getTime(),
  };
}

/** Every robot of the roster, retired ones only when asked, newest last. */
export async function listRoster(opts: { retired?: boolean } = {}): Promise<RosterEntry[]> {
  const db = appDb();
  const rows = await db
    .select(PUBLIC_COLUMNS)
    .from(robots)
    .where(opts.retired ? undefined : isNull(robots.retiredAt))
    .orderBy(robots.createdAt, robots.id);
  const names = new Map((await listFloorplans(db)).map((f) => [f.id, f.name]));
  return rows.map((r) => rosterEntry(r, names));
}

async function robotRow(db: Db, id: string): Promise<Robot> {
  const row = (await db.select().from(robots).where(eq(robots.id, id)).limit(1))[0];
  if (!row) throw new TesseraError("not_found", "robot", `There is no robot ${id} on the roster.`);
  return row;
}

async function activeRobot(db: Db, id: string, surface: string): Promise<Robot> {
  const row = await robotRow(db, id);
  if (row.retiredAt) throw new TesseraError("conflict", surface, `${row.name} is retired.`);
  return row;
}

/** One robot for its page: roster entry, live frame, recent missions and certainty over time. */
export async function robotDetail(id: string): Promise<RobotDetailView> {
  const db = appDb();
  const row = await robotRow(db, id);
  const names = new Map((await listFloorplans(db)).map((f) => [f.id, f.name]));
  const recent = await db
    .select()
    .from(missions)
    .where(eq(missions.robotId, id))
    .orderBy(desc(missions.startedAt), desc(missions.id))
    .limit(MISSIONS_SHOWN);
  const points = await db
    .select({ at: beliefs.createdAt, tileMass: beliefs.tileMass })
    .from(beliefs)
    .where(eq(beliefs.robotId, id))
    .orderBy(desc(beliefs.id))
    .limit(CERTAINTY_POINTS);
  return {
    robot: rosterEntry(row, names),
    frame: liveFrame(id),
    missions: recent.map(missionSummary),
    certainty: points.reverse().map((p) => ({ at: p.at.getTime(), tileMass: p.tileMass })),
  };
}

/**
 * Issues a new key: the old hash is replaced before the live link is closed, so the robot's
 * reconnect with the old key is refused with `bad_key`. The new key is returned this once.
 */
export async function rotateRobotKey(id: string, actor: Actor): Promise<{ key: string; dropped: boolean }> {
  const db = appDb();
  const row = await activeRobot(db, id, "key");
  const key = generateRobotKey();
  await db.update(robots).set({ keyHash: hashRobotKey(key) }).where(and(eq(robots.id, id), isNull(robots.retiredAt)));
  const dropped = runningFleet().dropLink(id, "bad_key");
  await writeAudit(db, actor.userId, "rotate-key", id, { name: row.name, dropped });
  return { key, dropped };
}

/** Retires a robot: it can no longer connect and leaves the live floor; its missions stay in the logbook. */
export async function retireRobot(id: string, actor: Actor): Promise<{ id: string; retiredAt: number }> {
  const db = appDb();
  const row = await activeRobot(db, id, "retire");
  const retiredAt = new Date();
  await db.update(robots).set({ retiredAt }).where(eq(robots.id, id));
  await runningFleet().retire(id, actor);
  await writeAudit(db, actor.userId, "retire", id, { name: row.name });
  return { id, retiredAt: retiredAt.getTime() };
}

function settingsView(row: Robot): SettingsView {
  const { settings } = resolveRobotSettings(row.drive, row.settings);
  const defaults = defaultRobotSettings(row.drive);
  const custom = (Object.keys(defaults) as (keyof RobotSettings)[]).filter((k) => !isDeepStrictEqual(settings[k], defaults[k]));
  return { robotId: row.id, drive: row.drive, settings, defaults, custom };
}

/** The tuning a robot runs with, the defaults of its drive, and which sections are its own. */
export async function robotSettings(id: string): Promise<SettingsView> {
  return settingsView(await robotRow(appDb(), id));
}

/** Parses a settings body; a bad value is a 422 naming each field by its dotted path. */
export function parseRobotSettings(raw: unknown): RobotSettings {
  const parsed = RobotSettingsSchema.safeParse(raw);
  if (!parsed.success) throw new TesseraError("unprocessable", "settings", "Some settings are out of range; nothing was saved.", { fields: zodFields(parsed.error) });
  return parsed.data;
}

/** Stores new tuning and applies it to the live filter from its next update. */
export async function saveRobotSettings(id: string, settings: RobotSettings, actor: Actor): Promise<SettingsView> {
  const db = appDb();
  const row = await activeRobot(db, id, "settings");
  const before = resolveRobotSettings(row.drive, row.settings).settings;
  await db.update(robots).set({ settings }).where(eq(robots.id, id));
  await runningFleet().applySettings(id, settings);
  const changed = (Object.keys(settings) as (keyof RobotSettings)[]).filter((k) => !isDeepStrictEqual(settings[k], before[k]));
  await writeAudit(db, actor.userId, "settings-change", id, { changed, settings });
  return settingsView({ ...row, settings });
}

/** Back to the defaults of lib/ for the robot's drive. */
export async function resetRobotSettings(id: string, actor: Actor): Promise<SettingsView> {
  const db = appDb();
  const row = await activeRobot(db, id, "settings");
  await db.update(robots).set({ settings: null }).where(eq(robots.id, id));
  await runningFleet().applySettings(id, defaultRobotSettings(row.drive));
  await writeAudit(db, actor.userId, "settings-reset", id, {});
  return settingsView({ ...row, settings: null });
}

/** Pushes the stored heading gains to the connected robot with `tune`. */
export async function pushRobotGains(id: string, actor: Actor): Promise<{ gains: RobotSettings["gains"] }> {
  const db = appDb();
  const row = await activeRobot(db, id, "tune");
  const { gains } = resolveRobotSettings(row.drive, row.settings).settings;
  if (!runningFleet().tune(id, gains)) throw new TesseraError("unprocessable", "tune", `${row.name} is not connected; the gains are saved and can be pushed when it is.`);
  await writeAudit(db, actor.userId, "tune", id, { gains });
  return { gains };
}

/** Floorplans a robot can be registered on. */
export async function floorplanChoices(): Promise<{ id: number; name: string }[]> {
  return listFloorplans(appDb());
}
