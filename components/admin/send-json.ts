/** JSON requests from admin and account forms, with the server's error message and field errors kept. */
export interface SendResult<T> {
  ok: boolean;
  status: number;
  data?: T;
  message?: string;
  fields?: Record<string, string[]>;
}

export async function sendJson<T>(method: "POST" | "PATCH", url: string, body?: unknown): Promise<SendResult<T>> {
  let res: Response;
  try {
    res = await fetch(url, { method, headers: { "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) });
  } catch {
    return { ok: false, status: 0, message: "The server could not be reached; check the connection and try again." };
  }
  const payload = (await res.json().catch(() => ({}))) as { error?: { message?: string; fields?: Record<string, string[]> } } & T;
  if (res.ok) return { ok: true, status: res.status, data: payload };
  return { ok: false, status: res.status, message: payload.error?.message ?? `The server answered ${res.status}.`, fields: payload.error?.fields };
}
