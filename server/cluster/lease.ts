/**
 * Robot leases in Redis: which node runs a robot's filter and mission. A lease is one key
 * `tessera:robot-lease:<id>` holding `<node>:<fence>` with an expiry; the fence is a
 * per-robot counter raised with every new lease, so a later owner always holds a larger
 * fence than any earlier one. Taking, renewing and giving up a lease are Lua scripts,
 * because each is a compare-and-set that must not interleave with another node's.
 */
import type { Redis } from "ioredis";

const leaseKey = (robotId: string) => `tessera:robot-lease:${robotId}`;
const fenceKey = (robotId: string) => `tessera:robot-fence:${robotId}`;

/**
 * KEYS: lease, fence counter. ARGV: node, ttl ms, the fence stored in the database. The new
 * fence, or nil when another node holds the lease. The counter is raised past the stored
 * fence because Redis keeps nothing across a restart, while the database keeps the fence.
 */
const ACQUIRE = `
if redis.call("EXISTS", KEYS[1]) == 1 then return nil end
local fence = redis.call("INCR", KEYS[2])
local stored = tonumber(ARGV[3])
if fence <= stored then
  fence = stored + 1
  redis.call("SET", KEYS[2], fence)
end
redis.call("SET", KEYS[1], ARGV[1] .. ":" .. fence, "PX", ARGV[2])
return fence`;

/** KEYS: lease. ARGV: expected value, ttl ms. 1 when the lease was still ours and is extended. */
const RENEW = `
if redis.call("GET", KEYS[1]) == ARGV[1] then return redis.call("PEXPIRE", KEYS[1], ARGV[2]) end
return 0`;

/** KEYS: lease. ARGV: expected value. 1 when our lease was removed. */
const RELEASE = `
if redis.call("GET", KEYS[1]) == ARGV[1] then return redis.call("DEL", KEYS[1]) end
return 0`;

export interface LeaseHolder {
  nodeId: string;
  fence: number;
}

export class LeaseStore {
  constructor(
    private readonly redis: Redis,
    readonly nodeId: string,
    readonly ttlMs: number,
  ) {}

  /** Takes the robot's lease when nobody holds it, under a fence above `storedFence`; the new fence, or null. */
  async acquire(robotId: string, storedFence = 0): Promise<number | null> {
    const fence = await this.redis.eval(ACQUIRE, 2, leaseKey(robotId), fenceKey(robotId), this.nodeId, this.ttlMs, storedFence);
    return fence === null ? null : Number(fence);
  }

  /** Extends this node's lease; false when it expired or another node holds it now. */
  async renew(robotId: string, fence: number): Promise<boolean> {
    return (await this.redis.eval(RENEW, 1, leaseKey(robotId), `${this.nodeId}:${fence}`, this.ttlMs)) === 1;
  }

  async release(robotId: string, fence: number): Promise<void> {
    await this.redis.eval(RELEASE, 1, leaseKey(robotId), `${this.nodeId}:${fence}`);
  }

  /** Who holds the robot's lease now, or null. */
  async holder(robotId: string): Promise<LeaseHolder | null> {
    const value = await this.redis.get(leaseKey(robotId));
    if (!value) return null;
    const at = value.lastIndexOf(":");
    return { nodeId: value.slice(0, at), fence: Number(value.slice(at + 1)) };
  }
}
