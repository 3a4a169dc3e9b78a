/** Mail in integration tests: the catcher on its own port and a wait for a message to arrive. */
import { desc, like } from "drizzle-orm";
import { expect } from "vitest";
import type { Db } from "../../db/client";
import { caughtMail, type CaughtMailRow } from "../../db/schema";

/** Integration suites' catcher port; CI and other worktrees set their own. */
export const TEST_SMTP_PORT = Number(process.env.TESSERA_TEST_SMTP_PORT ?? 2417);

/** The newest caught message to `address`, waiting for it to arrive. */
export async function mailTo(db: Db, address: string): Promise<CaughtMailRow> {
  let found: CaughtMailRow | undefined;
  await expect
    .poll(async () => {
      [found] = await db.select().from(caughtMail).where(like(caughtMail.to, `%"${address}"%`)).orderBy(desc(caughtMail.id)).limit(1);
      return found;
    })
    .toBeDefined();
  return found!;
}

/** The token of the first Tessera link of `kind` in a message's text. */
export function linkToken(text: string | null, kind: "invite" | "reset"): string {
  const match = new RegExp(`/${kind}/([A-Za-z0-9_-]{43})`).exec(text ?? "");
  if (!match) throw new Error(`no ${kind} link in: ${text}`);
  return match[1];
}
