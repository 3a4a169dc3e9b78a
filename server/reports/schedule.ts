/**
 * The end-of-shift digest: at TESSERA_SHIFT_END (local wall-clock time) each day, the
 * digest of the shift that just ended goes to the on-call list. A failed send is logged
 * and the next day's still happens.
 */
import type { Db } from "../../db/client";
import { SHIFT_MS, type ShiftRange } from "../../lib/protocol/reports";
import { reportsConfig } from "../config";
import { logger } from "../logger";
import { sendShiftDigest } from "./digest";
import { mailSender } from "./mail-port";

/** The first moment strictly after `nowMs` whose local time is `hhmm` ("18:30"), epoch ms. */
export function nextShiftEnd(nowMs: number, hhmm: string): number {
  const [hours, minutes] = hhmm.split(":").map(Number);
  const at = new Date(nowMs);
  at.setHours(hours, minutes, 0, 0);
  if (at.getTime() <= nowMs) at.setDate(at.getDate() + 1);
  // setDate keeps the wall-clock time across a DST change, which is what a shift end means.
  return at.getTime();
}

/** Runs `send` with the shift ending at each `hhmm`, until the returned stop is called. */
export function scheduleShiftEnds(hhmm: string, send: (range: ShiftRange) => Promise<void>): () => void {
  let timer: NodeJS.Timeout | undefined;
  let stopped = false;
  const arm = () => {
    const at = nextShiftEnd(Date.now(), hhmm);
    timer = setTimeout(() => {
      send({ from: at - SHIFT_MS, to: at })
        .catch((err: unknown) => logger.error({ err, shiftEnd: new Date(at).toISOString() }, "end-of-shift digest failed"))
        .finally(() => {
          if (!stopped) arm();
        });
    }, at - Date.now());
    timer.unref?.();
  };
  arm();
  return () => {
    stopped = true;
    clearTimeout(timer);
  };
}

/** Starts the daily digest when TESSERA_SHIFT_END is set; returns its stop. */
export function startShiftDigests(db: Db): () => void {
  const { shiftEnd } = reportsConfig();
  if (!shiftEnd) return () => {};
  logger.info({ shiftEnd }, "end-of-shift digest scheduled");
  return scheduleShiftEnds(shiftEnd, async (range) => {
    const sent = await sendShiftDigest(db, range, mailSender());
    logger.info({ to: sent.to.length, subject: sent.subject }, "end-of-shift digest sent");
  });
}
