/**
 * A stand-in for the load balancer in front of several nodes: a TCP forwarder on loopback
 * that sends each new connection to the first backend that accepts it, in its own order
 * of preference. A dead node refuses connections, so its robots' reconnects land on the
 * next node, as behind a balancer with health checks.
 */
import { createConnection, createServer, type Server, type Socket } from "node:net";
import type { AddressInfo } from "node:net";

export interface Balancer {
  url: string;
  stop(): Promise<void>;
}

function connectFirst(ports: number[]): Promise<Socket> {
  return new Promise((resolve, reject) => {
    const tryAt = (i: number) => {
      if (i >= ports.length) return reject(new Error("no backend accepted the connection"));
      const upstream = createConnection({ host: "127.0.0.1", port: ports[i] });
      upstream.once("connect", () => resolve(upstream));
      upstream.once("error", () => tryAt(i + 1));
    };
    tryAt(0);
  });
}

export async function startBalancer(backendPorts: number[]): Promise<Balancer> {
  const open = new Set<Socket>();
  const server: Server = createServer((client) => {
    open.add(client);
    client.pause();
    client.on("close", () => open.delete(client));
    client.on("error", () => client.destroy());
    connectFirst(backendPorts).then(
      (upstream) => {
        open.add(upstream);
        upstream.on("close", () => {
          open.delete(upstream);
          client.destroy();
        });
        upstream.on("error", () => upstream.destroy());
        client.on("close", () => upstream.destroy());
        client.pipe(upstream);
        upstream.pipe(client);
        client.resume();
      },
      () => client.destroy(),
    );
  });
  await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
  return {
    url: `http://127.0.0.1:${(server.address() as AddressInfo).port}`,
    async stop() {
      for (const socket of open) socket.destroy();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
