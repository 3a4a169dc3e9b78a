/**
 * Tessera's stand-in for a mail provider: an SMTP server on loopback that accepts every
 * message, parses it and keeps it in caught_mail for the admins' sent-mail page.
 */
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";
import type { Db } from "../../db/client";
import { caughtMail } from "../../db/schema";
import { logger } from "../logger";

/** Larger messages are refused; Tessera's own mail is a few kilobytes. */
const MAX_MESSAGE_BYTES = 2 * 1024 * 1024;

export interface MailCatcher {
  port: number;
  stop(): Promise<void>;
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
  const list = Array.isArray(field) ? field : field ? [field] : [];
  return list.flatMap((a) => a.value.map((v) => v.address ?? "")).filter(Boolean);
}

/** Starts the catcher on 127.0.0.1:`port`; resolves once it listens. */
export async function startMailCatcher(db: Db, port: number): Promise<MailCatcher> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["AUTH", "STARTTLS"],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const envelopeTo = session.envelope.rcptTo.map((r) => r.address);
          const to = addresses(parsed.to);
          await db.insert(caughtMail).values({
            from: (addresses(parsed.from)[0] ?? (session.envelope.mailFrom || { address: "" }).address).slice(0, 254),
            to: to.length ? to : envelopeTo,
            subject: (parsed.subject ?? "(no subject)").slice(0, 300),
            text: parsed.text ?? null,
            html: typeof parsed.html === "string" ? parsed.html : null,
          });
          callback();
        })
        .catch((err: unknown) => {
          logger.error({ err }, "mail catcher could not keep a message");
          callback(err instanceof Error ? err : new Error("message not kept"));
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    const refuse = (err: Error) =>
      reject(new Error(`The mail catcher cannot listen on 127.0.0.1:${port} (${err.message}); set MAIL_CATCHER_PORT to a free port, or SMTP_HOST to a real provider.`, { cause: err }));
    server.once("error", refuse);
    server.listen(port, "127.0.0.1", () => {
      server.off("error", refuse);
      resolve();
    });
  });
  server.on("error", (err) => logger.error({ err }, "mail catcher error"));
  logger.info({ port }, "mail catcher listening on loopback");
  return {
    port,
    stop: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
