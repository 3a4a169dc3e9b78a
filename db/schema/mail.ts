import { bigint, index, json, mysqlTable, text, timestamp, varchar } from "drizzle-orm/mysql-core";

/**
 * Mail received by Tessera's own SMTP catcher (npm start and the tests), shown to admins
 * on /mail so that an invite can be followed without a real mailbox.
 */
export const caughtMail = mysqlTable(
  "caught_mail",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    from: varchar("from_addr", { length: 254 }).notNull(),
    to: json("to_addrs").notNull().$type<string[]>(),
    subject: varchar("subject", { length: 300 }).notNull(),
    text: text("text"),
    html: text("html"),
    receivedAt: timestamp("received_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [index("caught_mail_received_idx").on(t.receivedAt)],
);

export type CaughtMailRow = typeof caughtMail.$inferSelect;
