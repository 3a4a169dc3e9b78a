import { bigint, boolean, json, mysqlEnum, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
import { DRIVES } from "../../lib/vocabulary";

/** A registered robot. Its secret key is stored only as a hash. */
export const robots = mysqlTable("robots", {
  id: varchar("id", { length: 40 }).primaryKey(),
  name: varchar("name", { length: 80 }).notNull(),
  keyHash: varchar("key_hash", { length: 128 }).notNull(),
  drive: mysqlEnum("drive", DRIVES).notNull().default("differential"),
  model: varchar("model", { length: 80 }).notNull().default(""),
  sensors: json("sensors").notNull().$type<unknown[]>(),
  settings: json("settings").$type<Record<string, unknown>>(),
  simulated: boolean("simulated").notNull().default(false),
  floorplanId: bigint("floorplan_id", { mode: "number", unsigned: true }),
  retiredAt: timestamp("retired_at", { fsp: 3 }),
  /**
   * The newest ownership fence any node has written this robot's log under (several nodes
   * sharing the fleet through Redis). A node's batch fails when this is newer than the fence
   * of its own lease, so a node that lost a robot can no longer write for it.
   */
  fence: bigint("fence", { mode: "number", unsigned: true }).notNull().default(0),
  createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
});

export type Robot = typeof robots.$inferSelect;
export type NewRobot = typeof robots.$inferInsert;
