import { bigint, customType, double, int, mysqlTable, timestamp, uniqueIndex, varchar, text } from "drizzle-orm/mysql-core";

/** Binary columns hold typed arrays (layers, beliefs, policies) as raw bytes. */
export const longblob = customType<{ data: Buffer; driverData: Buffer }>({
  dataType: () => "longblob",
});

export const floorplans = mysqlTable(
  "floorplans",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    name: varchar("name", { length: 120 }).notNull(),
    isDefault: int("is_default").notNull().default(0),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("floorplans_name_uq").on(t.name)],
);

/** An immutable version of a floorplan; missions pin the version they ran on. */
export const floorplanVersions = mysqlTable(
  "floorplan_versions",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    floorplanId: bigint("floorplan_id", { mode: "number", unsigned: true }).notNull(),
    version: int("version").notNull(),
    rows: int("rows").notNull(),
    cols: int("cols").notNull(),
    tileM: double("tile_m").notNull(),
    /** Four row-major byte layers back to back: blocked, mark, dock, nogo. */
    layers: longblob("layers").notNull(),
    note: text("note"),
    createdBy: bigint("created_by", { mode: "number", unsigned: true }),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("floorplan_versions_uq").on(t.floorplanId, t.version)],
);

export type FloorplanRow = typeof floorplans.$inferSelect;
export type FloorplanVersionRow = typeof floorplanVersions.$inferSelect;

/** The file an imported version was parsed from, kept as uploaded beside it. */
export const floorplanUploads = mysqlTable(
  "floorplan_uploads",
  {
    id: bigint("id", { mode: "number", unsigned: true }).autoincrement().primaryKey(),
    versionId: bigint("version_id", { mode: "number", unsigned: true }).notNull(),
    filename: varchar("filename", { length: 255 }).notNull(),
    mime: varchar("mime", { length: 100 }).notNull(),
    size: int("size").notNull(),
    bytes: longblob("bytes").notNull(),
    createdBy: bigint("created_by", { mode: "number", unsigned: true }),
    createdAt: timestamp("created_at", { fsp: 3 }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex("floorplan_uploads_version_uq").on(t.versionId)],
);

export type FloorplanUploadRow = typeof floorplanUploads.$inferSelect;
