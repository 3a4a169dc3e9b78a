/** Outgoing mail: nodemailer over SMTP into Tessera's own catcher, kept in caught_mail. */
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { closeDb, openDb, type Db } from "../../db/client";
import { caughtMail, users } from "../../db/schema";
import type { MailCatcher } from "../../server/mail/catcher";
import { mailTo, TEST_SMTP_PORT } from "../support/mail";

let db: Db;
let catcher: MailCatcher;
let mailer: typeof import("../../server/mail/mailer");
const stamp = `${process.pid}-${Date.now()}`;

beforeAll(async () => {
  process.env.DATABASE_URL = inject("databaseUrl");
  process.env.NEXTAUTH_SECRET = "tessera-integration-secret";
  process.env.MAIL_CATCHER_PORT = String(TEST_SMTP_PORT);
  delete process.env.SMTP_HOST;
  db = openDb(inject("databaseUrl"));
  const { startMailCatcher } = await import("../../server/mail/catcher");
  catcher = await startMailCatcher(db, TEST_SMTP_PORT);
  mailer = await import("../../server/mail/mailer");
});

afterAll(async () => {
  await catcher?.stop();
  await closeDb();
});

describe("mail", () => {
  it("keeps a sent message's sender, recipients, subject, text and HTML", async () => {
    const to = `mail-${stamp}@tessera.test`;
    await mailer.sendMail({ to, subject: `Shift digest ${stamp}`, text: "Kestrel held twice.\nOtter arrived.", html: "<p>Kestrel held <b>twice</b>.</p>" });
    const kept = await mailTo(db, to);
    expect(kept.subject).toBe(`Shift digest ${stamp}`);
    expect(kept.to).toEqual([to]);
    expect(kept.from).toBe("tessera@localhost");
    expect(kept.text?.trim()).toBe("Kestrel held twice.\nOtter arrived.");
    expect(kept.html).toContain("<b>twice</b>");
  });

  it("mails every active on-call user and nobody else", async () => {
    const emails = ["oncall-a", "oncall-b", "oncall-off", "oncall-gone"].map((p) => `${p}-${stamp}@tessera.test`);
    await db.insert(users).values([
      { email: emails[0], name: "On call A", passwordHash: "x", onCall: true },
      { email: emails[1], name: "On call B", passwordHash: "x", onCall: true },
      { email: emails[2], name: "Off call", passwordHash: "x", onCall: false },
      { email: emails[3], name: "Deactivated", passwordHash: "x", onCall: true, disabledAt: new Date() },
    ]);
    // Other suites may leave on-call users behind: count ours only, and turn them off after.
    const sent = await mailer.mailOnCall(`Hold on Badger ${stamp}`, "Badger is held: certainty under 0.3.", "<p>Badger is held.</p>");
    expect(sent).toBeGreaterThanOrEqual(2);
    for (const address of emails.slice(0, 2)) expect((await mailTo(db, address)).subject).toBe(`Hold on Badger ${stamp}`);
    const all = await db.select().from(caughtMail);
    const ours = all.filter((m) => m.subject === `Hold on Badger ${stamp}`).flatMap((m) => m.to);
    expect(ours).not.toContain(emails[2]);
    expect(ours).not.toContain(emails[3]);
    for (const address of emails) await db.update(users).set({ onCall: false }).where(eq(users.email, address));
  });

  it("refuses to start a second catcher on a port already taken, saying so", async () => {
    const { startMailCatcher } = await import("../../server/mail/catcher");
    await expect(startMailCatcher(db, TEST_SMTP_PORT)).rejects.toThrow(new RegExp(`cannot listen on 127.0.0.1:${TEST_SMTP_PORT} \\(.*EADDRINUSE.*\\); set MAIL_CATCHER_PORT`));
  });
});
