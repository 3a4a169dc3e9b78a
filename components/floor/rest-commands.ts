/**
 * The live floor's commands over the HTTP routes, one route per command; the answer comes
 * back in the same shape as an /ops acknowledgement so the rest of the page is unchanged.
 */
import type { OpsAck, OpsCommand, OpsCommandName } from "@/lib/protocol";

type CommandName = Exclude<OpsCommandName, "watch">;

/** How long a command waits for its answer before the page gives up, in ms. */
const COMMAND_TIMEOUT_MS = 8000;

/** Sends one command and settles with the server's answer or a refusal; never throws. */
export type SendCommand = <K extends CommandName>(name: K, payload: OpsCommand<K>) => Promise<OpsAck>;

function request<K extends CommandName>(name: K, payload: OpsCommand<K>): { url: string; body?: unknown } {
  const robot = (id: string, what: string) => `/api/robots/${encodeURIComponent(id)}/${what}`;
  switch (name) {
    case "dispatch":
      return { url: "/api/missions", body: payload };
    case "cancel":
    case "hold":
    case "release":
      return { url: robot((payload as OpsCommand<"hold">).robotId, name) };
    case "relocate": {
      const { robotId, ...pose } = payload as OpsCommand<"relocate">;
      return { url: robot(robotId, "relocate"), body: pose };
    }
    case "fault": {
      const { robotId, fault } = payload as OpsCommand<"fault">;
      return { url: robot(robotId, "fault"), body: fault };
    }
    case "ackAlert":
      return { url: `/api/alerts/${(payload as OpsCommand<"ackAlert">).alertId}/ack` };
  }
  throw new Error(`no route for the ${String(name)} command`);
}

/** Sends one command to its route; a refusal carries the route's `{ error }` body. */
export async function restCommand<K extends CommandName>(name: K, payload: OpsCommand<K>): Promise<OpsAck> {
  const { url, body } = request(name, payload);
  let res: Response;
  try {
    res = await fetch(url, {
      method: "POST",
      credentials: "same-origin",
      signal: AbortSignal.timeout(COMMAND_TIMEOUT_MS),
      headers: body === undefined ? undefined : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
  } catch {
    return { ok: false, error: { code: "unavailable:network", message: "The server did not answer in time; check the robot before trying again." } };
  }
  const json = (await res.json().catch(() => null)) as { error?: { code: string; message: string } } | null;
  if (res.ok) return { ok: true, data: json };
  return { ok: false, error: json?.error ?? { code: `http:${res.status}`, message: `The server answered ${res.status}.` } };
}
