import { describe, expect, it } from "vitest";
import type { ShiftFigures, ShiftSummary } from "../../lib/protocol/reports";
import { composeDigest, deliverDigest } from "./digest";
import type { MailMessage } from "./mail-port";
import { TesseraError } from "../errors";

const noHolds = { low_certainty: 0, operator: 0, offline: 0, traffic: 0, fault: 0 };
const figures = (over: Partial<ShiftFigures>): ShiftFigures => ({
  started: 0, reached: 0, aborted: 0, failed: 0, active: 0, underWayS: 0, medianReachS: null, certaintyMin: null, certaintyMean: null, holds: noHolds, ...over,
});

const summary: ShiftSummary = {
  from: Date.UTC(2026, 2, 1, 6, 0),
  to: Date.UTC(2026, 2, 1, 14, 0),
  floorplanId: 1,
  totals: figures({ started: 7, reached: 5, aborted: 1, failed: 1, underWayS: 3725, medianReachS: 95, certaintyMin: 0.21, certaintyMean: 0.58, holds: { ...noHolds, low_certainty: 3, traffic: 2 } }),
  robots: [
    { robotId: "rb-o", robotName: "Otter <lab 2>", ...figures({ started: 4, reached: 3, failed: 1, underWayS: 2000, medianReachS: 80, certaintyMin: 0.21, holds: { ...noHolds, low_certainty: 3 } }) },
    { robotId: "rb-m", robotName: "Magpie", ...figures({ started: 3, reached: 2, aborted: 1, underWayS: 1725, medianReachS: 110, certaintyMin: 0.4, holds: { ...noHolds, traffic: 2 } }) },
  ],
};

describe("composeDigest", () => {
  it("puts the range, the headline figures, holds by reason and every robot in subject, text and HTML", () => {
    const d = composeDigest(summary, "North Annex");
    expect(d.subject).toBe("Tessera shift summary, North Annex: 5 of 7 missions reached (2026-03-01 06:00 UTC – 2026-03-01 14:00 UTC)");
    expect(d.text).toContain("Missions started: 7");
    expect(d.text).toContain("Time under way: 1 h 02 min");
    expect(d.text).toContain("Median time to reach: 1 min 35 s");
    expect(d.text).toContain("Lowest certainty: 21 %");
    expect(d.text).toContain("  Low certainty: 3\n  Traffic: 2\n");
    expect(d.text).not.toContain("Operator: 0");
    expect(d.text).toContain("  Otter <lab 2>: 4 started, 3 reached, 0 aborted, 1 failed; median to reach 1 min 20 s; lowest certainty 21 %; 3 holds");
    expect(d.text).toContain("  Magpie: 3 started, 2 reached, 1 aborted, 0 failed; median to reach 1 min 50 s; lowest certainty 40 %; 2 holds");
    expect(d.html).toContain("Otter &lt;lab 2&gt;");
    expect(d.html).not.toContain("<lab 2>");
    expect(d.html).toContain(">Mean lowest certainty</td><td");
    expect(d.html).toContain(">58 %</td>");
  });

  it("says so when nothing happened", () => {
    const d = composeDigest({ ...summary, floorplanId: null, totals: figures({}), robots: [] }, null);
    expect(d.subject).toContain("all floorplans: 0 of 0 missions reached");
    expect(d.text).toContain("Holds by reason:\n  none");
    expect(d.text).toContain("no missions in this range");
    expect(d.text).toContain("Median time to reach: —");
  });
});

describe("deliverDigest", () => {
  it("hands the composed message to the sender, addressed to the list", async () => {
    const sent: MailMessage[] = [];
    const message = await deliverDigest(summary, { to: ["lead@site.test", "night@site.test"], floorplanName: "North Annex", send: async (m) => void sent.push(m) });
    expect(sent).toEqual([message]);
    expect(message.to).toEqual(["lead@site.test", "night@site.test"]);
    expect(message).toMatchObject(composeDigest(summary, "North Annex"));
  });

  it("refuses an empty list without calling the sender", async () => {
    let called = false;
    await expect(deliverDigest(summary, { to: [], floorplanName: null, send: async () => void (called = true) })).rejects.toMatchObject({ status: 422, message: expect.stringContaining("on-call list") });
    expect(called).toBe(false);
  });

  it("answers 503 when the sender fails, saying the digest was not sent", async () => {
    const refusing = async () => {
      throw new TesseraError("unavailable", "digest", "The mail server did not take the digest, so it was not sent.");
    };
    await expect(deliverDigest(summary, { to: ["lead@site.test"], floorplanName: null, send: refusing })).rejects.toMatchObject({ status: 503, code: "unavailable:digest", message: expect.stringContaining("not sent") });
  });
});
