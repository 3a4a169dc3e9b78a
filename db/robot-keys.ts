/**
 * Robot secret keys: 32 random bytes shown once, stored as a SHA-256 hash. A fast hash is
 * enough here because the keys carry 256 bits of entropy (unlike passwords, which use bcrypt).
 */
import { createHash, randomBytes, timingSafeEqual } from "node:crypto";

export function generateRobotKey(): string {
  return `tsk_${randomBytes(32).toString("base64url")}`;
}

export function hashRobotKey(key: string): string {
  return createHash("sha256").update(key, "utf8").digest("hex");
}

/** Constant-time comparison of a presented key against a stored hash. */
export function verifyRobotKey(key: string, storedHash: string): boolean {
  const presented = Buffer.from(hashRobotKey(key), "hex");
  const stored = Buffer.from(storedHash, "hex");
  return presented.length === stored.length && timingSafeEqual(presented, stored);
}
