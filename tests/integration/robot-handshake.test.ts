/** /robot sign-in against keys hashed in the real MariaDB (PROTOCOL.md, "Transport and sign-in"). */
import { createServer, type Server as HttpServer } from "node:http";
import type { AddressInfo } from "node:net";
import { Server } from "socket.io";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { attachRobotLink } from "../../server/robot-link";
import { tryRobotHandshake } from "../support/fleet-server";
import { insertTestRobot } from "../support/robot-fixtures";

let http: HttpServer;
let io: Server;
let db: Db;
let url: string;

beforeAll(async () => {
  db = openDb(inject("databaseUrl"));
  http = createServer();
  io = new Server(http);
  attachRobotLink(io, db);
  await new Promise<void>((resolve) => http.listen(0, "127.0.0.1", resolve));
  url = `http://127.0.0.1:${(http.address() as AddressInfo).port}/robot`;
});

afterAll(async () => {
  await new Promise<void>((resolve) => io.close(() => resolve()));
  await closeDb();
});

const handshake = (auth: Record<string, unknown>) => tryRobotHandshake(url, auth);

describe("robot handshake", () => {
  it("admits a registered robot with its own key", async () => {
    const robot = await insertTestRobot(db);
    expect(await handshake({ robot: robot.id, key: robot.key })).toEqual({ connected: true });
  });

  it("refuses a wrong key with bad_key", async () => {
    const robot = await insertTestRobot(db);
    expect(await handshake({ robot: robot.id, key: `${robot.key}x` })).toEqual({ connected: false, data: { code: "bad_key" } });
  });

  it("refuses another robot's key with bad_key", async () => {
    const first = await insertTestRobot(db);
    const second = await insertTestRobot(db);
    expect(await handshake({ robot: first.id, key: second.key })).toEqual({ connected: false, data: { code: "bad_key" } });
  });

  it("refuses an id the roster does not know with unknown_robot", async () => {
    expect(await handshake({ robot: "rb-nobody", key: "tsk_whatever" })).toEqual({ connected: false, data: { code: "unknown_robot" } });
  });

  it("refuses a retired robot with retired", async () => {
    const robot = await insertTestRobot(db, { retired: true });
    expect(await handshake({ robot: robot.id, key: robot.key })).toEqual({ connected: false, data: { code: "retired" } });
  });

  it("refuses a handshake without auth fields as bad_key", async () => {
    expect(await handshake({})).toEqual({ connected: false, data: { code: "bad_key" } });
  });
});
