import { bigint, double, index, json, mysqlEnum, mysqlTable, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { longblob } from "./floorplans";

export const EVENT_SOURCES = ["robot", "server", "operator"] as const;

/**
 * Every robot message (seq set; unique per robot) and every command the server or an
 * operator issued (seq null), in the order they were applied: `id` is that order.
 */
export const events = mysqlTable(
  "events",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    robotId: varchar("robot_id", { length: 40 }).notNull(),
    seq: bigint("seq", { mode: "number", unsigned: true }),
    missionId: bigint("mission_id", { mode: "number", unsigned: true }),
    source: mysqlEnum("source", EVENT_SOURCES).notNull(),
    kind: varchar("kind", { length: 24 }).notNull(),
    payload: json("payload").notNull(),
    robotAt: bigint("robot_at", { mode: "number" }),
    receivedAt: timestamp("received_at", { fsp: 3 }).notNull(),
  },
  (t) => [
    uniqueIndex("events_robot_seq_uq").on(t.robotId, t.seq),
    index("events_mission_idx").on(t.missionId, t.id),
    index("events_robot_idx").on(t.robotId, t.id),
  ],
);

/** Periodic belief snapshots: the belief right after event `eventId` was applied. */
export const beliefs = mysqlTable(
  "beliefs",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    robotId: varchar("robot_id", { length: 40 }).notNull(),
    eventId: bigint("event_id", { mode: "number", unsigned: true }).notNull(),
    missionId: bigint("mission_id", { mode: "number", unsigned: true }),
    versionId: bigint("version_id", { mode: "number", unsigned: true }).notNull(),
    /** Float64 belief over every state. */
    belief: longblob("belief").notNull(),
    tileMass: double("tile_mass").notNull(),
    entropy: double("entropy").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull(),
  },
  (t) => [index("beliefs_robot_idx").on(t.robotId, t.eventId), index("beliefs_mission_idx").on(t.missionId, t.eventId)],
);

export type EventRow = typeof events.$inferSelect;
export type NewEventRow = typeof events.$inferInsert;
export type BeliefRow = typeof beliefs.$inferSelect;
