/** Alert e-mails: which alerts are mailed, to whom, and the per-robot rate limit. */
import { describe, expect, it } from "vitest";
import { AlertMailer, type OutgoingMail } from "./alert-mail";

function setup(recipients = ["oncall@tessera.test"]) {
  const sent: OutgoingMail[] = [];
  let now = 1_800_000_000_000;
  const mailer = new AlertMailer({
    send: async (m) => {
      sent.push(m);
    },
    recipients: async () => recipients,
    windowMs: 10 * 60_000,
    publicUrl: "http://127.0.0.1:3000/",
    robotName: (id) => (id === "r1" ? "Kestrel" : undefined),
    now: () => now,
  });
  const alert = (robotId: string, kind: "low_certainty" | "offline" | "traffic" | "mission_failed" = "low_certainty") => ({ id: 1, robotId, kind, message: `${robotId} held`, createdAt: now });
  return { sent, mailer, alert, advance: (ms: number) => (now += ms) };
}

describe("alert e-mails", () => {
  it("mails a low-certainty hold to the on-call list with the robot's name and a link to the live floor", async () => {
    const { sent, mailer, alert } = setup(["a@tessera.test", "b@tessera.test"]);
    expect(await mailer.handle(alert("r1"))).toBe("sent");
    expect(sent).toHaveLength(1);
    expect(sent[0].to).toEqual(["a@tessera.test", "b@tessera.test"]);
    expect(sent[0].subject).toBe("Tessera: Kestrel held: low certainty");
    expect(sent[0].text).toContain("http://127.0.0.1:3000/floor");
  });

  it("sends a flapping robot one mail per window and counts what it folded into the next", async () => {
    const { sent, mailer, alert, advance } = setup();
    expect(await mailer.handle(alert("r1"))).toBe("sent");
    for (let i = 0; i < 50; i++) {
      advance(5_000);
      expect(await mailer.handle(alert("r1", i % 2 ? "offline" : "low_certainty"))).toBe("suppressed");
    }
    expect(await mailer.handle(alert("r2", "mission_failed"))).toBe("sent");
    advance(10 * 60_000);
    expect(await mailer.handle(alert("r1", "offline"))).toBe("sent");
    expect(sent).toHaveLength(3);
    expect(sent[2].text).toContain("50 earlier alerts for Kestrel");
  });

  it("leaves traffic waits to the live floor and sends nothing without on-call recipients", async () => {
    const quiet = setup([]);
    expect(await quiet.mailer.handle(quiet.alert("r1"))).toBe("no_recipients");
    const { sent, mailer, alert } = setup();
    expect(await mailer.handle(alert("r1", "traffic"))).toBe("not_mailed");
    expect(sent).toHaveLength(0);
  });

  it("escapes the alert text in the HTML part", async () => {
    const { sent, mailer } = setup();
    await mailer.handle({ id: 2, robotId: "r9", kind: "fault", message: "<script>x</script> & more", createdAt: 0 });
    expect(sent[0].html).not.toContain("<script>");
    expect(sent[0].html).toContain("&#60;script&#62;");
  });
});
