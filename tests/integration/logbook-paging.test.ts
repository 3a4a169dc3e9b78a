/**
 * The logbook's list (issue 7, part 8) with three thousand seeded missions: paging,
 * filters and order return the rows a recomputation from the seed says they should, and
 * the page queries the indexes support read an index rather than the whole table.
 */
import { and, desc, eq, gte, sql, type SQL } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, currentPool, openDb, type Db } from "../../db/client";
import { missions, robots } from "../../db/schema";
import { MISSION_STATES, type MissionState } from "../../lib/vocabulary";
import { listMissions, MissionListQuery } from "../../server/logbook";
import { seededUniform } from "../support/plans";
import { seedFloorplan, seedMissions, seedRobots, type SeedMission } from "../support/report-seed";

const COUNT = 3000;
// A span of 2024 no other suite writes into.
const SPAN_FROM = Date.UTC(2024, 1, 1);
const SPAN_MS = 20 * 86_400_000;

let db: Db;
let floorplanId = 0;
let robotIds: string[] = [];
let seeded: (SeedMission & { id: number })[] = [];

beforeAll(async () => {
  const url = inject("databaseUrl");
  // listMissions reads the app's configured database, as the route does.
  process.env.DATABASE_URL = url;
  process.env.NEXTAUTH_SECRET ??= "tessera-integration-secret";
  db = openDb(url);
  const plan = await seedFloorplan(db, `Paging bay ${Date.now() % 1_000_000}`);
  floorplanId = plan.floorplanId;
  robotIds = await seedRobots(db, floorplanId, ["Pager one", "Pager two", "Pager three"]);
  const random = seededUniform(11);
  const list: SeedMission[] = [];
  for (let i = 0; i < COUNT; i++) {
    const state = MISSION_STATES[Math.floor(random() * MISSION_STATES.length)] as MissionState;
    // Every tenth start repeats the same robot's start before it, so order must fall back to the id.
    const startedAt = i % 10 === 9 ? list[i - 3].startedAt : SPAN_FROM + Math.floor(random() * SPAN_MS);
    list.push({ robotId: robotIds[i % 3], versionId: plan.versionId, state, startedAt, endedAt: state === "active" ? null : startedAt + 30_000, minCertainty: 0.5, goalRow: i % 3, goalCol: i % 4 });
  }
  const ids = await seedMissions(db, list);
  seeded = list.map((m, i) => ({ ...m, id: ids[i] }));
  await db.execute(sql`ANALYZE TABLE missions`);
}, 120_000);

afterAll(async () => {
  await closeDb();
});

/** The seed rows the filters keep, newest first, ties by the larger id. */
function expectedIds(keep: (m: SeedMission & { id: number }) => boolean): number[] {
  return seeded
    .filter(keep)
    .sort((a, b) => b.startedAt - a.startedAt || b.id - a.id)
    .map((m) => m.id);
}

async function page(params: Record<string, string>) {
  return listMissions(MissionListQuery.parse(params));
}

describe("logbook paging with 3000 missions", () => {
  it("pages one robot's missions: first, second and last page, and the total", async () => {
    const robot = robotIds[1];
    const want = expectedIds((m) => m.robotId === robot);
    expect(want).toHaveLength(COUNT / 3);
    const first = await page({ robot, limit: "50", page: "1" });
    expect(first.total).toBe(COUNT / 3);
    expect(first.items.map((m) => m.id)).toEqual(want.slice(0, 50));
    const second = await page({ robot, limit: "50", page: "2" });
    expect(second.items.map((m) => m.id)).toEqual(want.slice(50, 100));
    const lastPage = Math.ceil(want.length / 50);
    const last = await page({ robot, limit: "50", page: String(lastPage) });
    expect(last.items.map((m) => m.id)).toEqual(want.slice((lastPage - 1) * 50));
    expect(last.items.length).toBe(want.length - (lastPage - 1) * 50);
    const beyond = await page({ robot, limit: "50", page: String(lastPage + 1) });
    expect(beyond).toEqual({ total: COUNT / 3, items: [] });
  });

  it("orders newest first and breaks equal start times by id", async () => {
    const { items } = await page({ robot: robotIds[0], limit: "200" });
    for (let i = 1; i < items.length; i++) {
      const [a, b] = [items[i - 1], items[i]];
      expect(a.startedAt > b.startedAt || (a.startedAt === b.startedAt && a.id > b.id)).toBe(true);
    }
    expect(items.some((m, i) => i > 0 && m.startedAt === items[i - 1].startedAt)).toBe(true);
  });

  it("filters by outcome, range and floorplan together with the robot", async () => {
    const robot = robotIds[2];
    const failed = await page({ robot, outcome: "failed", limit: "100" });
    const wantFailed = expectedIds((m) => m.robotId === robot && m.state === "failed");
    expect(failed.total).toBe(wantFailed.length);
    expect(failed.items.map((m) => m.id)).toEqual(wantFailed.slice(0, 100));
    expect(failed.items.every((m) => m.state === "failed" && m.robotId === robot && m.durationS === 30)).toBe(true);

    const from = SPAN_FROM + 5 * 86_400_000;
    const to = SPAN_FROM + 9 * 86_400_000;
    const ranged = await page({ robot, from: new Date(from).toISOString(), to: new Date(to).toISOString(), limit: "200", page: "2" });
    const wantRanged = expectedIds((m) => m.robotId === robot && m.startedAt >= from && m.startedAt <= to);
    expect(ranged.total).toBe(wantRanged.length);
    expect(ranged.items.map((m) => m.id)).toEqual(wantRanged.slice(200, 400));

    const onPlan = await page({ floorplan: String(floorplanId), outcome: "active", limit: "50", page: "3" });
    const wantActive = expectedIds((m) => m.state === "active");
    expect(onPlan.total).toBe(wantActive.length);
    expect(onPlan.items.map((m) => m.id)).toEqual(wantActive.slice(100, 150));
    expect(onPlan.items.every((m) => m.endedAt === null && m.durationS === null)).toBe(true);
  });

  it("refuses a page size above 200 and a page below 1", () => {
    expect(MissionListQuery.safeParse({ limit: "201" }).success).toBe(false);
    expect(MissionListQuery.safeParse({ page: "0" }).success).toBe(false);
  });

  it("reads an index, not the whole table, for a page by robot and a page by outcome", async () => {
    const pageQuery = (where: SQL) =>
      db
        .select({ id: missions.id, robotName: robots.name })
        .from(missions)
        .leftJoin(robots, eq(robots.id, missions.robotId))
        .where(where)
        .orderBy(desc(missions.startedAt), desc(missions.id))
        .limit(50)
        .offset(50)
        .toSQL();
    const explain = async (q: { sql: string; params: unknown[] }) => {
      const [rows] = (await currentPool()!.query(`EXPLAIN ${q.sql}`, q.params)) as unknown as [{ table: string; type: string; key: string | null }[]];
      return rows.find((r) => r.table === "missions")!;
    };
    const byRobot = await explain(pageQuery(eq(missions.robotId, robotIds[0])));
    expect(byRobot.key).toBe("missions_robot_idx");
    expect(byRobot.type).not.toBe("ALL");
    const byOutcome = await explain(pageQuery(eq(missions.state, "failed")));
    expect(byOutcome.key).toBe("missions_state_idx");
    expect(byOutcome.type).not.toBe("ALL");
    const both = await explain(pageQuery(and(eq(missions.robotId, robotIds[0]), eq(missions.state, "failed"))!));
    expect(["missions_robot_idx", "missions_state_idx"]).toContain(both.key);
    // No filter: newest first straight off the start-time index, no sort of the whole log.
    const plain = await explain(pageQuery(gte(missions.id, 0)));
    expect(plain.key).toBe("missions_started_idx");
  });
});
