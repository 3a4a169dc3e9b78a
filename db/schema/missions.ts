import { bigint, double, index, int, mysqlEnum, mysqlTable, timestamp, varchar } from "drizzle-orm/mysql-core";
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
  (t) => [index("missions_robot_idx").on(t.robotId, t.startedAt), index("missions_state_idx").on(t.state, t.startedAt)],
);

export type MissionRow = typeof missions.$inferSelect;
