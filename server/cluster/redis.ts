/**
 * The Redis connections of a node: one for commands and publishing, one subscribed for
 * the socket.io adapter, which carries dashboard broadcasts and the requests between
 * nodes (server/cluster/node-requests.ts).
 */
import { createAdapter } from "@socket.io/redis-adapter";
import { Redis } from "ioredis";
import type { Server } from "socket.io";
import { logger } from "../logger";

export interface RedisLinks {
  redis: Redis;
  close(): Promise<void>;
}

/** Connects to Redis (failing start-up when it does not answer) and puts socket.io on the Redis adapter. */
export async function connectRedis(url: string, io: Server, requestsTimeoutMs: number): Promise<RedisLinks> {
  // Commands queued while Redis is away fail after one reconnection attempt instead of
  // waiting for ever; the lease timer judges expiry by its own clock meanwhile.
  const redis = new Redis(url, { lazyConnect: true, maxRetriesPerRequest: 1 });
  const sub = redis.duplicate();
  for (const [name, client] of [
    ["redis", redis],
    ["redis-subscriber", sub],
  ] as const) {
    client.on("error", (err: unknown) => logger.warn({ err, client: name }, "redis connection error"));
  }
  try {
    await Promise.all([redis.connect(), sub.connect()]);
  } catch (err) {
    redis.disconnect();
    sub.disconnect();
    throw new Error(`Tessera cannot reach Redis at ${url.replace(/\/\/[^@]*@/, "//")}: ${(err as Error).message}`, { cause: err });
  }
  io.adapter(createAdapter(redis, sub, { requestsTimeout: requestsTimeoutMs }));
  return {
    redis,
    async close() {
      await Promise.allSettled([redis.quit(), sub.quit()]);
    },
  };
}
