/** The traffic rule over peers: claims and confident standing block a tile, on the same floorplan version only. */
import { describe, expect, it } from "vitest";
import { trafficBlocker, type TrafficPeer } from "./traffic";

const peer = (over: Partial<TrafficPeer>): TrafficPeer => ({ id: "b", name: "Otter", versionId: 1, hold: null, hasMission: true, claim: null, standing: null, route: [], givingWay: false, detouring: false, ...over });
const tile = { row: 4, col: 7 };

describe("trafficBlocker", () => {
  it("is blocked by a claim on the tile and by a robot standing there with enough mass", () => {
    expect(trafficBlocker([peer({ claim: tile })], "a", 1, tile, 0.4)?.id).toBe("b");
    expect(trafficBlocker([peer({ standing: { ...tile, tileMass: 0.4 } })], "a", 1, tile, 0.4)?.id).toBe("b");
  });

  it("lets a robot pass an unsure neighbour, another version's robot, another tile and itself", () => {
    expect(trafficBlocker([peer({ standing: { ...tile, tileMass: 0.39 } })], "a", 1, tile, 0.4)).toBeNull();
    expect(trafficBlocker([peer({ versionId: 2, claim: tile })], "a", 1, tile, 0.4)).toBeNull();
    expect(trafficBlocker([peer({ claim: { row: 4, col: 8 } })], "a", 1, tile, 0.4)).toBeNull();
    expect(trafficBlocker([peer({ id: "a", claim: tile })], "a", 1, tile, 0.4)).toBeNull();
  });
});
