/** Calls to the roster's routes from the browser; errors come back in ARCHITECTURE.md's shape. */

export interface ApiError {
  code: string;
  message: string;
  fields?: Record<string, string[]>;
}

export type ApiResult<T> = { ok: true; data: T } | { ok: false; error: ApiError };

/** Sends JSON to a roster route and reads its answer; a network failure becomes an error too. */
export async function rosterCall<T>(method: "POST" | "PUT" | "DELETE", path: string, body?: unknown): Promise<ApiResult<T>> {
  try {
    const res = await fetch(path, {
      method,
      headers: body === undefined ? {} : { "content-type": "application/json" },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const json = (await res.json().catch(() => null)) as { error?: ApiError } | null;
    if (!res.ok) return { ok: false, error: json?.error ?? { code: `http:${res.status}`, message: `The server answered ${res.status}.` } };
    return { ok: true, data: json as T };
  } catch {
    return { ok: false, error: { code: "network", message: "The server could not be reached; try again." } };
  }
}
