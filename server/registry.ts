/**
 * Process-wide handles shared with route handlers through globalThis, because Next
 * bundles route handlers apart from the custom server and module singletons differ.
 */
import type { Server } from "socket.io";

interface Registry {
  io?: Server;
}

const holder = globalThis as unknown as { __tesseraRegistry?: Registry };

export function registry(): Registry {
  return (holder.__tesseraRegistry ??= {});
}
