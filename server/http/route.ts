/**
 * The one wrapper every route handler uses: finds the signed-in user, checks the role,
 * parses the query and JSON body with zod, and turns every failure into the error shape.
 */
import { getServerSession } from "next-auth";
import type { NextRequest } from "next/server";
import type { z } from "zod";
import { roleAllows } from "../../lib/roles";
import type { Role } from "../../lib/vocabulary";
import { authOptions, type SessionUser } from "../auth/options";
import { isTesseraError, TesseraError, zodFields } from "../errors";
import { logger } from "../logger";

export interface RouteContext<Q, B> {
  req: NextRequest;
  user: SessionUser | null;
  query: Q;
  body: B;
  params: Record<string, string>;
}

interface RouteSpec<QS extends z.ZodType, BS extends z.ZodType> {
  /** Least role needed; "public" routes need no sign-in. */
  role: Role | "public";
  surface: string;
  query?: QS;
  body?: BS;
}

type Handler<Q, B> = (ctx: RouteContext<Q, B>) => Promise<Response | unknown>;

export function errorResponse(err: unknown, surface: string): Response {
  if (isTesseraError(err)) return Response.json(err.toBody(), { status: err.status });
  logger.error({ err, surface }, "unhandled error in route");
  const internal = new TesseraError("internal", surface, "Something went wrong on the server; it has been logged.");
  return Response.json(internal.toBody(), { status: 500 });
}

export function route<QS extends z.ZodType = z.ZodUndefined, BS extends z.ZodType = z.ZodUndefined>(
  spec: RouteSpec<QS, BS>,
  handler: Handler<z.infer<QS>, z.infer<BS>>,
) {
  return async (req: NextRequest, segment?: { params?: Promise<Record<string, string>> }): Promise<Response> => {
    try {
      let user: SessionUser | null = null;
      if (spec.role !== "public") {
        const session = await getServerSession(authOptions());
        user = (session as unknown as { user?: SessionUser } | null)?.user ?? null;
        if (!user) throw new TesseraError("unauthorized", spec.surface, "Sign in first.");
        if (!roleAllows(user.role, spec.role)) {
          throw new TesseraError("forbidden", spec.surface, `This needs the ${spec.role} role; you are ${user.role}.`);
        }
      }
      let query: unknown = undefined;
      if (spec.query) {
        const parsed = spec.query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
        if (!parsed.success) throw new TesseraError("bad_request", spec.surface, "The query string is not valid.", { fields: zodFields(parsed.error) });
        query = parsed.data;
      }
      let body: unknown = undefined;
      if (spec.body) {
        let raw: unknown;
        try {
          raw = await req.json();
        } catch (cause) {
          throw new TesseraError("bad_request", spec.surface, "The request body is not valid JSON.", { cause });
        }
        const parsed = spec.body.safeParse(raw);
        if (!parsed.success) throw new TesseraError("bad_request", spec.surface, "The request body is not valid.", { fields: zodFields(parsed.error) });
        body = parsed.data;
      }
      const params = (await segment?.params) ?? {};
      const result = await handler({ req, user, query: query as z.infer<QS>, body: body as z.infer<BS>, params });
      return result instanceof Response ? result : Response.json(result);
    } catch (err) {
      return errorResponse(err, spec.surface);
    }
  };
}
