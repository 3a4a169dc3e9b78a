/** The live floor store: snapshot seeding, per-robot updates that keep other entries, selection and pending goals. */
import { describe, expect, it } from "vitest";
import type { AlertFrame, LiveFloorSnapshot, RobotFrame } from "@/lib/protocol/ops-feed";
import { createFloorStore } from "@/components/floor/store";

function robot(robotId: string, name: string, over: Partial<RobotFrame> = {}): RobotFrame {
  return {
    robotId,
    name,
    floorplanId: 3,
    versionId: 8,
    simulated: true,
    online: true,
    state: "idle",
    holdReason: null,
    battery: 0.81,
    estimate: { row: 2, col: 5, heading: "E", tileMass: 0.62, entropy: 0.21 },
    mission: null,
    certaintyHistory: [0.4, 0.55, 0.62],
    lastMessageAt: 1_700_000_000_000,
    ...over,
  };
}

function alert(id: number, createdAt: number, over: Partial<AlertFrame> = {}): AlertFrame {
  return { id, robotId: "r2", kind: "low_certainty", message: "certainty under 30 % for 6 steps", createdAt, ackBy: null, ackAt: null, ...over };
}

function snapshot(robots: RobotFrame[], alerts: AlertFrame[] = []): LiveFloorSnapshot {
  return {
    floorplan: { id: 3, name: "Annex", versionId: 8, version: 1, rows: 2, cols: 3, tileM: 0.3048, blocked: [0, 0, 1, 0, 0, 0], mark: [0, 0, 0, 0, 0, 0], dock: [0, 0, 0, 0, 0, 0], nogo: [0, 0, 0, 0, 0, 0] },
    floorplans: [{ id: 3, name: "Annex" }],
    robots,
    alerts,
  };
}

describe("createFloorStore", () => {
  it("keeps this floor's robots in natural name order and selects the first", () => {
    const store = createFloorStore(snapshot([robot("r10", "Tern-10"), robot("r2", "Tern-2"), robot("x", "Elsewhere", { floorplanId: 9 }), robot("u", "Unplaced", { floorplanId: null })]));
    const s = store.getState();
    expect(s.robotIds).toEqual(["r2", "r10", "u"]);
    expect(s.selectedId).toBe("r2");
  });

  it("sorts alerts newest first", () => {
    const store = createFloorStore(snapshot([], [alert(1, 100), alert(2, 300), alert(3, 200)]));
    expect(store.getState().alerts.map((a) => a.id)).toEqual([2, 3, 1]);
    expect(store.getState().selectedId).toBeNull();
  });
});

describe("robot frames", () => {
  it("replaces one robot and leaves the other entry and the id list untouched", () => {
    const store = createFloorStore(snapshot([robot("r1", "Ada"), robot("r2", "Bea")]));
    const before = store.getState();
    store.getState().upsertRobot(robot("r1", "Ada", { state: "under_way", battery: 0.74 }));
    const after = store.getState();
    expect(after.robots.r1.state).toBe("under_way");
    expect(after.robots.r2).toBe(before.robots.r2);
    expect(after.robotIds).toBe(before.robotIds);
  });

  it("drops a robot that moves to another floorplan and moves the selection on", () => {
    const store = createFloorStore(snapshot([robot("r1", "Ada"), robot("r2", "Bea")]));
    store.getState().upsertRobot(robot("r1", "Ada", { floorplanId: 12 }));
    expect(store.getState().robotIds).toEqual(["r2"]);
    expect(store.getState().selectedId).toBe("r2");
  });

  it("clears a pending goal once a frame carries that goal, not another", () => {
    const store = createFloorStore(snapshot([robot("r1", "Ada")]));
    store.getState().setPendingGoal("r1", { row: 1, col: 2 });
    const mission = (row: number, col: number) => ({ id: 41, goal: { row, col }, step: 0, claim: null, route: [{ row, col }], givingWayTo: null, detouring: false });
    store.getState().upsertRobot(robot("r1", "Ada", { mission: mission(0, 1) }));
    expect(store.getState().pendingGoals.r1).toEqual({ row: 1, col: 2 });
    store.getState().upsertRobot(robot("r1", "Ada", { mission: mission(1, 2) }));
    expect(store.getState().pendingGoals.r1).toBeUndefined();
  });
});

describe("selection and alerts", () => {
  it("steps through robots and wraps at both ends", () => {
    const store = createFloorStore(snapshot([robot("a", "A"), robot("b", "B"), robot("c", "C")]));
    const s = () => store.getState();
    s().selectStep(1);
    expect(s().selectedId).toBe("b");
    s().selectStep(-1);
    s().selectStep(-1);
    expect(s().selectedId).toBe("c");
    s().selectStep(1);
    expect(s().selectedId).toBe("a");
    s().select(null);
    s().selectStep(-1);
    expect(s().selectedId).toBe("c");
  });

  it("removes a robot and its belief", () => {
    const store = createFloorStore(snapshot([robot("a", "A"), robot("b", "B")]));
    store.getState().putBelief({ robotId: "a", rows: 2, cols: 3, scale: 0.5, data: new Uint8Array(6) });
    store.getState().removeRobot("a");
    expect(store.getState().beliefs.a).toBeUndefined();
    expect(store.getState().selectedId).toBe("b");
  });

  it("replaces an alert by id when it is acknowledged", () => {
    const store = createFloorStore(snapshot([], [alert(5, 100), alert(6, 200)]));
    store.getState().upsertAlert(alert(5, 100, { ackBy: "Operator Olu", ackAt: 450 }));
    const alerts = store.getState().alerts;
    expect(alerts.map((a) => a.id)).toEqual([6, 5]);
    expect(alerts[1].ackBy).toBe("Operator Olu");
  });

  it("offers a newer version of its own floorplan only", () => {
    const store = createFloorStore(snapshot([robot("r2", "Tern-2")]));
    store.getState().noteVersion({ floorplanId: 9, versionId: 20, version: 2 });
    store.getState().noteVersion({ floorplanId: 3, versionId: 8, version: 1 });
    expect(store.getState().newerVersion).toBeNull();
    store.getState().noteVersion({ floorplanId: 3, versionId: 21, version: 2 });
    expect(store.getState().newerVersion).toEqual({ versionId: 21, version: 2 });
  });
});
