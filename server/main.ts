import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import next from "next";
import { Server } from "socket.io";
import { closeDb } from "../db/client";
import { attachAlertMail } from "./alerts/alert-mail";
import { attachAlertWebhook } from "./alerts/webhook";
import { startClusterNode, type ClusterNode } from "./cluster";
import { alertMailConfig, clusterConfig, config, demoErrandsEnabled, fleetConfig, mailConfig, publicUrl, webhookConfig } from "./config";
import { startDemoErrands } from "./fleet/demo-errands";
import { Fleet } from "./fleet/fleet";
import { appDb } from "./db";
import { healthReport } from "./health";
import { logger } from "./logger";
import { startMailCatcher, type MailCatcher } from "./mail/catcher";
import { sendEach } from "./mail/mailer";
import { onCallRecipients } from "./mail/recipients";
import { PEER_HEADER } from "./auth/sign-in-limit";
import { attachOpsFeed } from "./ops-feed";
import { registry } from "./registry";
import { attachRobotLink } from "./robot-link";
import { startShiftDigests } from "./reports/schedule";

/** Frames over this size are dropped by socket.io itself before any parsing; the link's own limit is lower. */
const MAX_FRAME_BYTES = 64 * 1024;

type Handler = (req: IncomingMessage, res: ServerResponse) => Promise<void>;

/** Without pages: the health report for load balancers and supervisors, and a JSON 404 for the rest. */
const linkOnlyHandler: Handler = async (req, res) => {
  const json = (status: number, body: unknown) => {
    res.writeHead(status, { "content-type": "application/json" });
    res.end(JSON.stringify(body));
  };
  if (req.method === "GET" && req.url?.split("?")[0] === "/api/health") {
    const report = await healthReport();
    json(report.ok ? 200 : 503, report);
    return;
  }
  json(404, { error: { code: "not_found", message: "This node serves the robot link and the /ops feed only (TESSERA_PAGES=off)." } });
};

async function pagesHandler(dev: boolean, hostname: string, port: number): Promise<Handler> {
  const app = next({ dev, hostname, port, dir: process.cwd() });
  await app.prepare();
  const handle = app.getRequestHandler();
  return (req, res) => handle(req, res);
}

export async function startTessera(): Promise<void> {
  const c = config();
  const dev = c.NODE_ENV !== "production";
  const handle = c.TESSERA_PAGES === "on" ? await pagesHandler(dev, c.HOST, c.PORT) : linkOnlyHandler;

  const http = createServer((req, res) => {
    // Overwritten on every request, so a client cannot choose the address sign-in limits count.
    req.headers[PEER_HEADER] = req.socket.remoteAddress ?? "unknown";
    handle(req, res).catch((err: unknown) => {
      logger.error({ err, url: req.url }, "request failed");
      res.statusCode = 500;
      res.end("Internal error");
    });
  });

  const io = new Server(http, { path: "/socket.io", maxHttpBufferSize: MAX_FRAME_BYTES, serveClient: false });
  registry().io = io;
  const db = appDb();
  const fleet = new Fleet(db, fleetConfig());
  await fleet.start();
  registry().fleet = fleet;
  // Several nodes share the fleet only with REDIS_URL; without it nothing below touches Redis.
  const clusterSettings = clusterConfig();
  const node: ClusterNode | undefined = clusterSettings ? await startClusterNode(io, db, fleet, clusterSettings) : undefined;
  if (node) {
    registry().routeCommand = (name, payload, user) => node.commands.run(name, payload, user);
    registry().floorFrames = async (floorplanId) => (await node.view.floor(floorplanId)).robots;
  }
  attachRobotLink(io, db, fleet, node?.claim);
  attachOpsFeed(io, fleet, node ? (floorplanId) => node.view.floor(floorplanId) : undefined);
  // Without a real provider, mail goes to Tessera's own catcher and shows on /mail.
  const mail = mailConfig();
  const catcher: MailCatcher | undefined = mail.SMTP_HOST ? undefined : await startMailCatcher(db, mail.MAIL_CATCHER_PORT);
  const stopErrands = demoErrandsEnabled() ? startDemoErrands(fleet) : () => {};
  const stopReports = [
    attachAlertWebhook(fleet, webhookConfig()),
    startShiftDigests(db),
    attachAlertMail(fleet, {
      send: sendEach,
      recipients: () => onCallRecipients(db),
      windowMs: alertMailConfig().windowMs,
      publicUrl: publicUrl(),
      robotName: (id) => fleet.robots.get(id)?.name,
    }),
  ];

  await new Promise<void>((resolve) => http.listen(c.PORT, c.HOST, resolve));
  logger.info({ url: `http://${c.HOST}:${c.PORT}`, mode: dev ? "development" : "production", pages: c.TESSERA_PAGES }, "Tessera is listening");

  let stopping = false;
  const shutdown = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, "shutting down");
    const force = setTimeout(() => process.exit(1), 10_000);
    force.unref();
    await new Promise<void>((resolve) => {
      io.close(() => resolve());
      http.closeAllConnections?.();
    });
    stopErrands();
    for (const stop of stopReports) stop();
    await catcher?.stop();
    await fleet.stop();
    await node?.stop();
    await closeDb();
    logger.info("stopped");
    process.exit(0);
  };
  process.on("SIGINT", () => void shutdown("SIGINT"));
  process.on("SIGTERM", () => void shutdown("SIGTERM"));
}
