/**
 * The crew as admins manage it: list, invite, change role, deactivate, on-call, send a link.
 * Every change writes its audit row in the same transaction; the e-mail goes after commit.
 */
import bcrypt from "bcryptjs";
import { and, asc, eq, isNull } from "drizzle-orm";
import type { Db } from "../../db/client";
import { users, userTokens, type User } from "../../db/schema";
import type { CrewMember, InviteInput, LinkKind, UserPatch } from "../../lib/crew/schemas";
import { writeAudit } from "../audit/audit";
import type { SessionUser } from "../auth/options";
import { publicUrl } from "../config";
import { appDb } from "../db";
import { TesseraError } from "../errors";
import { logger } from "../logger";
import { sendMail } from "../mail/mailer";
import { inviteMail, resetMail } from "./messages";
import { LINK_TTL_MS, newLinkToken } from "./tokens";

type Tx = Parameters<Parameters<Db["transaction"]>[0]>[0];

const SURFACE = "users";

/** An invited user has no password yet: the empty hash never matches one. */
export const NO_PASSWORD = "";

export function toMember(u: User): CrewMember {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    role: u.role,
    state: u.disabledAt ? "deactivated" : u.passwordHash === NO_PASSWORD ? "invited" : "active",
    onCall: u.onCall,
    createdAt: u.createdAt.getTime(),
  };
}

export async function listCrew(): Promise<CrewMember[]> {
  const rows = await appDb().select().from(users).orderBy(asc(users.name), asc(users.id));
  return rows.map(toMember);
}

function linkUrl(kind: LinkKind, token: string): string {
  return `${publicUrl().replace(/\/$/, "")}/${kind}/${token}`;
}

/** Stores a fresh link for the user inside `tx`; older unused links of that kind stop working. */
export async function issueLink(tx: Tx, userId: number, kind: LinkKind, createdBy: number | null): Promise<string> {
  await tx
    .update(userTokens)
    .set({ usedAt: new Date() })
    .where(and(eq(userTokens.userId, userId), eq(userTokens.kind, kind), isNull(userTokens.usedAt)));
  const { token, hash } = newLinkToken();
  await tx.insert(userTokens).values({ userId, kind, tokenHash: hash, expiresAt: new Date(Date.now() + LINK_TTL_MS[kind]), createdBy });
  return linkUrl(kind, token);
}

/** Sends a link mail; a failure after the rows are committed says so instead of hiding it. */
async function deliver(mail: Parameters<typeof sendMail>[0], saved: string, retry: string): Promise<void> {
  try {
    await sendMail(mail);
  } catch (cause) {
    logger.error({ err: cause, to: mail.to }, "link mail not sent");
    throw new TesseraError("unavailable", SURFACE, `${saved} is saved, but the e-mail to ${String(mail.to)} could not be sent; use ${retry} on the crew page to try again.`, { cause });
  }
}

function isDuplicate(err: unknown): boolean {
  return typeof err === "object" && err !== null && ("code" in err ? (err as { code?: string }).code === "ER_DUP_ENTRY" : isDuplicate((err as { cause?: unknown }).cause));
}

/** Adds a user without a password and e-mails them a 72-hour link to set one. */
export async function inviteMember(actor: SessionUser, invite: InviteInput): Promise<CrewMember> {
  // Addresses are kept lower-case, as sign-in looks them up.
  const input = { ...invite, email: invite.email.trim().toLowerCase() };
  const db = appDb();
  const actorId = Number(actor.id);
  let created: { id: number; url: string };
  try {
    created = await db.transaction(async (tx) => {
      const [{ id }] = await tx.insert(users).values({ email: input.email, name: input.name, role: input.role, passwordHash: NO_PASSWORD }).$returningId();
      const url = await issueLink(tx, id, "invite", actorId);
      await writeAudit(tx, actorId, "invite", input.email, { userId: id, role: input.role });
      return { id, url };
    });
  } catch (err) {
    if (isDuplicate(err)) {
      throw new TesseraError("conflict", SURFACE, `${input.email} is already on the crew.`, { fields: { email: ["This e-mail address already has an account."] }, cause: err });
    }
    throw err;
  }
  await deliver(inviteMail(input, input.role, actor.name, created.url), `The invite for ${input.email}`, "Resend invite");
  const [row] = await db.select().from(users).where(eq(users.id, created.id));
  return toMember(row);
}

/**
 * Role, deactivation and on-call in one transaction. The last active admin can be neither
 * demoted nor deactivated: the admins' rows are locked while counted, so two admins demoting
 * each other at once cannot both succeed.
 */
export async function changeMember(actor: SessionUser, id: number, patch: UserPatch): Promise<CrewMember> {
  const actorId = Number(actor.id);
  const db = appDb();
  await db.transaction(async (tx) => {
    // Admins are locked before the target, in one order for every caller: two admins demoting
    // each other then queue up instead of deadlocking, and the second sees the first's change.
    const admins =
      patch.role !== undefined || patch.disabled !== undefined
        ? await tx.select({ id: users.id }).from(users).where(and(eq(users.role, "admin"), isNull(users.disabledAt))).for("update")
        : [];
    const [user] = await tx.select().from(users).where(eq(users.id, id)).for("update");
    if (!user) throw new TesseraError("not_found", SURFACE, `There is no user ${id}.`);
    const activeAdmin = user.role === "admin" && !user.disabledAt;
    const demoted = patch.role !== undefined && patch.role !== "admin";
    if (activeAdmin && (demoted || patch.disabled === true) && admins.length <= 1) {
      const what = patch.disabled === true ? "deactivated" : `made ${patch.role}`;
      throw new TesseraError("conflict", SURFACE, `${user.name} is the last active admin and cannot be ${what}; make another user admin first.`);
    }
    const set: Partial<User> = {};
    if (patch.role !== undefined && patch.role !== user.role) {
      set.role = patch.role;
      await writeAudit(tx, actorId, "role-change", user.email, { userId: id, from: user.role, to: patch.role });
    }
    if (patch.disabled !== undefined && patch.disabled !== Boolean(user.disabledAt)) {
      set.disabledAt = patch.disabled ? new Date() : null;
      await writeAudit(tx, actorId, patch.disabled ? "deactivate" : "reactivate", user.email, { userId: id });
    }
    if (patch.onCall !== undefined && patch.onCall !== user.onCall) {
      set.onCall = patch.onCall;
      await writeAudit(tx, actorId, "on-call", user.email, { userId: id, onCall: patch.onCall });
    }
    if (Object.keys(set).length) await tx.update(users).set(set).where(eq(users.id, id));
  });
  const [row] = await db.select().from(users).where(eq(users.id, id));
  return toMember(row);
}

/** An admin e-mails a user a new link: a reset, or the invite again when no password is set yet. */
export async function sendMemberLink(actor: SessionUser, id: number): Promise<{ kind: LinkKind; email: string }> {
  const actorId = Number(actor.id);
  const { user, kind, url } = await appDb().transaction(async (tx) => {
    const [row] = await tx.select().from(users).where(eq(users.id, id)).for("update");
    if (!row) throw new TesseraError("not_found", SURFACE, `There is no user ${id}.`);
    if (row.disabledAt) throw new TesseraError("conflict", SURFACE, `${row.name} is deactivated; reactivate the account before sending a link.`);
    const linkKind: LinkKind = row.passwordHash === NO_PASSWORD ? "invite" : "reset";
    const link = await issueLink(tx, id, linkKind, actorId);
    await writeAudit(tx, actorId, linkKind === "invite" ? "invite-sent" : "reset-sent", row.email, { userId: id });
    return { user: row, kind: linkKind, url: link };
  });
  const mail = kind === "invite" ? inviteMail(user, user.role, actor.name, url) : resetMail(user, url);
  await deliver(mail, `The ${kind === "invite" ? "invite" : "reset link"} for ${user.email}`, kind === "invite" ? "Resend invite" : "Send reset");
  return { kind, email: user.email };
}

/** bcrypt hash of a new password, at the cost the seed uses. */
export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, 10);
}
