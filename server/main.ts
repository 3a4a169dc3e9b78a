import { createServer } from "node:http";
import next from "next";
import { Server } from "socket.io";
import { closeDb } from "../db/client";
import { attachAlertMail } from "./alerts/alert-mail";
import { attachAlertWebhook } from "./alerts/webhook";
import { alertMailConfig, config, demoErrandsEnabled, fleetConfig, mailConfig, publicUrl, webhookConfig } from "./config";
import { startDemoErrands } from "./fleet/demo-errands";
import { Fleet } from "./fleet/fleet";
import { appDb } from "./db";
import { logger } from "./logger";
import { startMailCatcher, type MailCatcher } from "./mail/catcher";
import { sendEach } from "./mail/mailer";
import { onCallRecipients } from "./mail/recipients";
import { attachOpsFeed } from "./ops-feed";
import { registry } from "./registry";
import { attachRobotLink } from "./robot-link";
import { startShiftDigests } from "./reports/schedule";

/** Frames over this size are dropped by socket.io itself before any parsing; the link's own limit is lower. */
const MAX_FRAME_BYTES = 64 * 1024;

export async function startTessera(): Promise<void> {
  const c = config();
  const dev = c.NODE_ENV !== "production";
  const app = next({ dev, hostname: c.HOST, port: c.PORT, dir: process.cwd() });
  await app.prepare();
  const handle = app.getRequestHandler();

  const http = createServer((req, res) => {
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
  attachRobotLink(io, db, fleet);
  attachOpsFeed(io, fleet);
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
  logger.info({ url: `http://${c.HOST}:${c.PORT}`, mode: dev ? "development" : "production" }, "Tessera is listening");

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
    await closeDb();
    logger.info("stopped");
    process.exit(0);
  };
  process.on("SIGINT", () => void shutdown("SIGINT"));
  process.on("SIGTERM", () => void shutdown("SIGTERM"));
}
