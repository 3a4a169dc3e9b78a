import { bigint, index, json, mysqlEnum, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";
import { ALERT_KINDS } from "../../lib/vocabulary";

export const alerts = mysqlTable(
  "alerts",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    robotId: varchar("robot_id", { length: 40 }),
    missionId: bigint("mission_id", { mode: "number", unsigned: true }),
    kind: mysqlEnum("kind", ALERT_KINDS).notNull(),
    message: text("message").notNull(),
    ackBy: bigint("ack_by", { mode: "number", unsigned: true }),
    ackAt: timestamp("ack_at", { fsp: 3 }),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("alerts_created_idx").on(t.createdAt)],
);

/** Who did what: every operator and admin action. */
export const audit = mysqlTable(
  "audit",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    userId: bigint("user_id", { mode: "number", unsigned: true }),
    action: varchar("action", { length: 60 }).notNull(),
    target: varchar("target", { length: 120 }).notNull(),
    detail: json("detail"),
    at: timestamp("at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("audit_at_idx").on(t.at)],
);

export type AlertRow = typeof alerts.$inferSelect;
