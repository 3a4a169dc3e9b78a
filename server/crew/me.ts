/** The signed-in user's own profile: name and password, the password only with the current one. */
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { users } from "../../db/schema";
import type { CrewMember, MePatch } from "../../lib/crew/schemas";
import { writeAudit } from "../audit/audit";
import type { SessionUser } from "../auth/options";
import { appDb } from "../db";
import { TesseraError } from "../errors";
import { hashPassword, toMember } from "./members";

const SURFACE = "me";

export async function myProfile(user: SessionUser): Promise<CrewMember> {
  const [row] = await appDb().select().from(users).where(eq(users.id, Number(user.id)));
  if (!row) throw new TesseraError("not_found", SURFACE, "Your account no longer exists.");
  return toMember(row);
}

export async function updateMe(user: SessionUser, patch: MePatch): Promise<CrewMember> {
  const id = Number(user.id);
  const db = appDb();
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(users).where(eq(users.id, id)).for("update");
    if (!row) throw new TesseraError("not_found", SURFACE, "Your account no longer exists.");
    const set: { name?: string; passwordHash?: string } = {};
    if (patch.newPassword !== undefined) {
      const ok = await bcrypt.compare(patch.currentPassword ?? "", row.passwordHash);
      if (!ok) throw new TesseraError("bad_request", SURFACE, "The current password is not right; your password is unchanged.", { fields: { currentPassword: ["This is not your current password."] } });
      set.passwordHash = await hashPassword(patch.newPassword);
      await writeAudit(tx, id, "password-change", row.email, { userId: id });
    }
    if (patch.name !== undefined && patch.name !== row.name) {
      set.name = patch.name;
      await writeAudit(tx, id, "name-change", row.email, { userId: id, from: row.name, to: patch.name });
    }
    if (Object.keys(set).length) await tx.update(users).set(set).where(eq(users.id, id));
  });
  return myProfile(user);
}
