import { bigint, int, mysqlTable, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { longblob } from "./floorplans";

/** A solved policy per floorplan version, goal tile and motion model (by hash). */
export const policies = mysqlTable(
  "policies",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    versionId: bigint("version_id", { mode: "number", unsigned: true }).notNull(),
    goalRow: int("goal_row").notNull(),
    goalCol: int("goal_col").notNull(),
    modelHash: varchar("model_hash", { length: 64 }).notNull(),
    /** Float64 cost-to-go per state. */
    value: longblob("value").notNull(),
    /** Uint8 action index per state. */
    action: longblob("action").notNull(),
    computeMs: int("compute_ms").notNull(),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("policies_key_uq").on(t.versionId, t.goalRow, t.goalCol, t.modelHash)],
);

export type PolicyRow = typeof policies.$inferSelect;
