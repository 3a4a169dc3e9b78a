/**
 * One error model for HTTP responses and socket acknowledgements: a code of the form
 * `type:surface`, one HTTP status per type. The original error travels as `cause`.
 */
export const ERROR_STATUS = {
  bad_request: 400,
  unauthorized: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  too_large: 413,
  unsupported: 415,
  unprocessable: 422,
  rate_limited: 429,
  internal: 500,
  unavailable: 503,
} as const;

export type ErrorType = keyof typeof ERROR_STATUS;

export interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]> };
}

export class TesseraError extends Error {
  readonly type: ErrorType;
  readonly surface: string;
  readonly fields?: Record<string, string[]>;

  constructor(type: ErrorType, surface: string, message: string, opts?: { fields?: Record<string, string[]>; cause?: unknown }) {
    super(message, { cause: opts?.cause });
    this.name = "TesseraError";
    this.type = type;
    this.surface = surface;
    this.fields = opts?.fields;
  }

  get code(): string {
    return `${this.type}:${this.surface}`;
  }

  get status(): number {
    return ERROR_STATUS[this.type];
  }

  toBody(): ErrorBody {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}

/** Field-by-field messages from a zod error, keyed by dotted path ("" for the root). */
export function zodFields(error: { issues: { path: PropertyKey[]; message: string }[] }): Record<string, string[]> {
  const fields: Record<string, string[]> = {};
  for (const issue of error.issues) {
    const key = issue.path.map(String).join(".");
    (fields[key] ??= []).push(issue.message);
  }
  return fields;
}

/**
 * True for a TesseraError from any copy of this module: route handlers are bundled apart
 * from the custom server, so an error thrown by the fleet fails `instanceof` there.
 */
export function isTesseraError(err: unknown): err is TesseraError {
  return err instanceof TesseraError || (err instanceof Error && err.name === "TesseraError" && typeof (err as TesseraError).toBody === "function");
}
