/**
 * The traffic rule across nodes: each node tells the others, through Redis, where the
 * robots it serves stand and which tiles they claim, and keeps what the others told it.
 * Only changes that matter to the rule travel (tile, claim, hold, mission, version, route,
 * detours, stepping aside), a few per step rather than every frame. A robot whose node died stays
 * where it was last seen, which is where it physically stopped, until its new owner reports it.
 */
import type { Namespace } from "socket.io";
import type { Fleet } from "../fleet/fleet";
import { peerOfFrame, type TrafficPeer } from "../fleet/traffic";
import type { Ownership } from "./ownership";

const EVENT = "tessera:traffic";
const ALL = "tessera:traffic:all";

/** What the rule reads of a peer; a change in it is worth telling the other nodes. */
function keyOf(p: TrafficPeer, trafficMass: number): string {
  const standing = p.standing && p.standing.tileMass >= trafficMass ? `${p.standing.row},${p.standing.col}` : "-";
  const route = p.route.map((t) => `${t.row},${t.col}`).join(";");
  return `${p.versionId}|${p.claim ? `${p.claim.row},${p.claim.col}` : "-"}|${standing}|${p.hold ?? "-"}|${p.hasMission}|${p.givingWay}|${p.detouring}|${route}`;
}

/** Wires `fleet.remotePeers` to what the other nodes report, and reports this node's robots to them. */
export function shareTraffic(nsp: Namespace, fleet: Fleet, ownership: Ownership): void {
  const remote = new Map<string, TrafficPeer>();
  const told = new Map<string, string>();
  const mass = fleet.config.trafficMass;
  nsp.on(EVENT, (peer: TrafficPeer) => {
    if (peer && typeof peer.id === "string" && !ownership.owns(peer.id)) remote.set(peer.id, peer);
  });
  fleet.on("robot", (frame) => {
    if (!ownership.owns(frame.robotId)) return;
    const peer = peerOfFrame(frame);
    if (!peer) return;
    const key = keyOf(peer, mass);
    if (told.get(peer.id) === key) return;
    told.set(peer.id, key);
    nsp.serverSideEmit(EVENT, peer);
  });
  // A node that joins later asks for what the others would otherwise only tell on a change.
  nsp.on(ALL, (reply: (peers: TrafficPeer[]) => void) => {
    if (typeof reply !== "function") return;
    reply(fleet.frames().flatMap((f) => (ownership.owns(f.robotId) ? [peerOfFrame(f)].filter((p): p is TrafficPeer => p !== null) : [])));
  });
  nsp.serverSideEmit(ALL, (_err: Error | null, answers: TrafficPeer[][]) => {
    for (const peer of (answers ?? []).flat()) if (!ownership.owns(peer.id) && !remote.has(peer.id)) remote.set(peer.id, peer);
  });
  fleet.remotePeers = () => remote.values();
}
