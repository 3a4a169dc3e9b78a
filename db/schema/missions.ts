import { bigint, double, index, int, mysqlEnum, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";
import { longblob } from "./floorplans";
import { MISSION_STATES } from "../../lib/vocabulary";

export const missions = mysqlTable(
  "missions",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    robotId: varchar("robot_id", { length: 40 }).notNull(),
    versionId: bigint("version_id", { mode: "number", unsigned: true }).notNull(),
    goalRow: int("goal_row").notNull(),
    goalCol: int("goal_col").notNull(),
    state: mysqlEnum("state", MISSION_STATES).notNull().default("active"),
    steps: int("steps").notNull().default(0),
    holds: int("holds").notNull().default(0),
    minCertainty: double("min_certainty"),
    createdBy: bigint("created_by", { mode: "number", unsigned: true }),
    startedAt: timestamp("started_at", { fsp: 3 }).notNull().defaultNow(),
    endedAt: timestamp("ended_at", { fsp: 3 }),
  },
  (t) => [
    index("missions_robot_idx").on(t.robotId, t.startedAt),
    index("missions_state_idx").on(t.state, t.startedAt),
    index("missions_started_idx").on(t.startedAt, t.id),
    index("missions_version_idx").on(t.versionId, t.startedAt),
  ],
);

export type MissionRow = typeof missions.$inferSelect;

/** An operator's or lead's note on a mission, optionally pinned to a replay step. */
export const missionNotes = mysqlTable(
  "mission_notes",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    missionId: bigint("mission_id", { mode: "number", unsigned: true }).notNull(),
    userId: bigint("user_id", { mode: "number", unsigned: true }).notNull(),
    step: int("step"),
    text: text("text").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("mission_notes_mission_idx").on(t.missionId, t.createdAt)],
);

/** A photo attached to a note: the checked original and a small thumbnail. */
export const missionPhotos = mysqlTable(
  "mission_photos",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    noteId: bigint("note_id", { mode: "number", unsigned: true }).notNull(),
    mime: varchar("mime", { length: 100 }).notNull(),
    width: int("width").notNull(),
    height: int("height").notNull(),
    bytes: longblob("bytes").notNull(),
    thumb: longblob("thumb").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("mission_photos_note_idx").on(t.noteId)],
);

export type MissionNoteRow = typeof missionNotes.$inferSelect;
export type MissionPhotoRow = typeof missionPhotos.$inferSelect;
