import { bigint, boolean, index, mysqlEnum, mysqlTable, timestamp, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { ROLES } from "../../lib/vocabulary";

export const users = mysqlTable(
  "users",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    email: varchar("email", { length: 254 }).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    role: mysqlEnum("role", ROLES).notNull().default("viewer"),
    passwordHash: varchar("password_hash", { length: 100 }).notNull(),
    disabledAt: timestamp("disabled_at", { fsp: 3 }),
    /** Receives alert e-mails. */
    onCall: boolean("on_call").notNull().default(false),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("users_email_uq").on(t.email)],
);

export type User = typeof users.$inferSelect;
export type NewUser = typeof users.$inferInsert;

/**
 * Single-use links sent by e-mail: an invite (the invitee sets a first password) or a
 * password reset. Only a hash of the token is stored, like a password.
 */
export const userTokens = mysqlTable(
  "user_tokens",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    userId: bigint("user_id", { mode: "number", unsigned: true }).notNull(),
    kind: mysqlEnum("kind", ["invite", "reset"]).notNull(),
    tokenHash: varchar("token_hash", { length: 64 }).notNull(),
    expiresAt: timestamp("expires_at", { fsp: 3 }).notNull(),
    usedAt: timestamp("used_at", { fsp: 3 }),
    createdBy: bigint("created_by", { mode: "number", unsigned: true }),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("user_tokens_hash_uq").on(t.tokenHash), index("user_tokens_user_idx").on(t.userId)],
);

export type UserTokenRow = typeof userTokens.$inferSelect;
