/**
 * Who may use what: every API route and method, every page and every /ops command with its
 * least role and a harmless sample request. tests/e2e/access.test.ts checks this table
 * against the files on disk and OPS_COMMAND_ROLES, then runs each row as signed out,
 * viewer, operator and admin. A new route, page or command fails that test until it has a row.
 *
 * Samples change nothing: mutating requests name ids that do not exist or carry a body that
 * fails validation, which the routes check only after the role.
 */
import type { OpsCommandName } from "../../lib/protocol";
import type { Role } from "../../lib/vocabulary";

export type Least = Role | "public";
export type HttpMethod = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

export interface ApiSample {
  least: Least;
  /** The URL path (and query) to request. */
  path: string;
  /** JSON body; a string is sent as it is with its own content type. */
  body?: unknown;
  contentType?: string;
}

export interface PageSample {
  least: Least;
  path: string;
}

export interface OpsSample {
  least: Role;
  payload: unknown;
}

const NO_ID = 999_999_999;
const NO_ROBOT = "no-such-robot";
/** Well-formed (43 base64url characters) but never issued. */
const NO_TOKEN = "A".repeat(43);

/** Keyed by the route's URL pattern as its folder under app/ spells it. */
export const API_ROUTES: Record<string, Partial<Record<HttpMethod, ApiSample>>> = {
  "/api/alerts": { GET: { least: "viewer", path: "/api/alerts" } },
  "/api/alerts/[id]/ack": { POST: { least: "operator", path: `/api/alerts/${NO_ID}/ack` } },
  "/api/audit": { GET: { least: "admin", path: "/api/audit" } },
  "/api/auth-links/[token]": {
    GET: { least: "public", path: `/api/auth-links/${NO_TOKEN}` },
    POST: { least: "public", path: `/api/auth-links/${NO_TOKEN}`, body: {} },
  },
  "/api/auth-links/reset-request": { POST: { least: "public", path: "/api/auth-links/reset-request", body: {} } },
  "/api/auth/[...nextauth]": {
    GET: { least: "public", path: "/api/auth/session" },
    // Without a csrfToken next-auth answers with a redirect and signs nobody in or out.
    POST: { least: "public", path: "/api/auth/signout", body: "", contentType: "application/x-www-form-urlencoded" },
  },
  "/api/floorplans": {
    GET: { least: "viewer", path: "/api/floorplans" },
    POST: { least: "admin", path: "/api/floorplans", body: {} },
  },
  "/api/floorplans/[id]": { GET: { least: "viewer", path: `/api/floorplans/${NO_ID}` } },
  "/api/floorplans/[id]/export": { GET: { least: "viewer", path: `/api/floorplans/${NO_ID}/export?format=json` } },
  "/api/floorplans/[id]/original": { GET: { least: "admin", path: `/api/floorplans/${NO_ID}/original` } },
  "/api/floorplans/[id]/versions": { POST: { least: "admin", path: `/api/floorplans/${NO_ID}/versions`, body: {} } },
  "/api/floorplans/preview": { POST: { least: "admin", path: "/api/floorplans/preview", body: {} } },
  "/api/health": { GET: { least: "public", path: "/api/health" } },
  "/api/mail": { GET: { least: "admin", path: "/api/mail" } },
  "/api/me": {
    GET: { least: "viewer", path: "/api/me" },
    PATCH: { least: "viewer", path: "/api/me", body: {} },
  },
  "/api/missions": {
    GET: { least: "viewer", path: "/api/missions" },
    POST: { least: "operator", path: "/api/missions", body: {} },
  },
  "/api/missions/[id]": { GET: { least: "viewer", path: `/api/missions/${NO_ID}` } },
  "/api/missions/[id]/certainty": {
    GET: { least: "viewer", path: `/api/missions/${NO_ID}/certainty` },
    POST: { least: "viewer", path: `/api/missions/${NO_ID}/certainty`, body: {} },
  },
  "/api/missions/[id]/events": { GET: { least: "viewer", path: `/api/missions/${NO_ID}/events` } },
  "/api/missions/[id]/export": { GET: { least: "viewer", path: `/api/missions/${NO_ID}/export?format=json` } },
  "/api/missions/[id]/notes": {
    GET: { least: "viewer", path: `/api/missions/${NO_ID}/notes` },
    POST: { least: "operator", path: `/api/missions/${NO_ID}/notes`, body: {} },
  },
  "/api/missions/[id]/photos/[photoId]": { GET: { least: "viewer", path: `/api/missions/${NO_ID}/photos/${NO_ID}` } },
  "/api/missions/[id]/replay": { GET: { least: "viewer", path: `/api/missions/${NO_ID}/replay` } },
  "/api/reports/shift": { GET: { least: "viewer", path: "/api/reports/shift" } },
  "/api/reports/shift/digest": { POST: { least: "operator", path: "/api/reports/shift/digest", body: { from: "not a time" } } },
  "/api/robots": {
    GET: { least: "viewer", path: "/api/robots" },
    POST: { least: "admin", path: "/api/robots", body: {} },
  },
  "/api/robots/[id]": { GET: { least: "viewer", path: `/api/robots/${NO_ROBOT}` } },
  "/api/robots/[id]/cancel": { POST: { least: "operator", path: `/api/robots/${NO_ROBOT}/cancel` } },
  "/api/robots/[id]/fault": { POST: { least: "admin", path: `/api/robots/${NO_ROBOT}/fault`, body: {} } },
  "/api/robots/[id]/hold": { POST: { least: "operator", path: `/api/robots/${NO_ROBOT}/hold` } },
  "/api/robots/[id]/key": { POST: { least: "admin", path: `/api/robots/${NO_ROBOT}/key` } },
  "/api/robots/[id]/release": { POST: { least: "operator", path: `/api/robots/${NO_ROBOT}/release` } },
  "/api/robots/[id]/relocate": { POST: { least: "operator", path: `/api/robots/${NO_ROBOT}/relocate`, body: {} } },
  "/api/robots/[id]/retire": { POST: { least: "admin", path: `/api/robots/${NO_ROBOT}/retire` } },
  "/api/robots/[id]/settings": {
    GET: { least: "viewer", path: `/api/robots/${NO_ROBOT}/settings` },
    PUT: { least: "admin", path: `/api/robots/${NO_ROBOT}/settings`, body: {} },
    DELETE: { least: "admin", path: `/api/robots/${NO_ROBOT}/settings` },
  },
  "/api/robots/[id]/tune": { POST: { least: "admin", path: `/api/robots/${NO_ROBOT}/tune` } },
  "/api/users": {
    GET: { least: "admin", path: "/api/users" },
    POST: { least: "admin", path: "/api/users", body: {} },
  },
  "/api/users/[id]": { PATCH: { least: "admin", path: `/api/users/${NO_ID}`, body: {} } },
  "/api/users/[id]/reset": { POST: { least: "admin", path: `/api/users/${NO_ID}/reset` } },
};

/** Keyed by the page's URL pattern, route groups left out. */
export const PAGES: Record<string, PageSample> = {
  // proxy.ts sends the signed-out to sign-in; everyone else is forwarded to /floor.
  "/": { least: "viewer", path: "/" },
  "/sign-in": { least: "public", path: "/sign-in" },
  "/invite/[token]": { least: "public", path: `/invite/${NO_TOKEN}` },
  "/reset": { least: "public", path: "/reset" },
  "/reset/[token]": { least: "public", path: `/reset/${NO_TOKEN}` },
  "/floor": { least: "viewer", path: "/floor" },
  "/floorplans": { least: "viewer", path: "/floorplans" },
  "/floorplans/[id]": { least: "viewer", path: `/floorplans/${NO_ID}` },
  "/floorplans/import": { least: "admin", path: "/floorplans/import" },
  "/logbook": { least: "viewer", path: "/logbook" },
  "/logbook/[id]": { least: "viewer", path: `/logbook/${NO_ID}` },
  "/logbook/[id]/summary": { least: "viewer", path: `/logbook/${NO_ID}/summary` },
  "/roster": { least: "viewer", path: "/roster" },
  "/roster/[id]": { least: "viewer", path: `/roster/${NO_ROBOT}` },
  "/reports": { least: "viewer", path: "/reports" },
  "/profile": { least: "viewer", path: "/profile" },
  "/crew": { least: "admin", path: "/crew" },
  "/audit": { least: "admin", path: "/audit" },
  "/mail": { least: "admin", path: "/mail" },
};

/** Payloads fail validation, which the feed checks only after the role. */
export const OPS_COMMANDS: Record<OpsCommandName, OpsSample> = {
  watch: { least: "viewer", payload: {} },
  dispatch: { least: "operator", payload: {} },
  cancel: { least: "operator", payload: {} },
  hold: { least: "operator", payload: {} },
  release: { least: "operator", payload: {} },
  relocate: { least: "operator", payload: {} },
  ackAlert: { least: "operator", payload: {} },
  fault: { least: "admin", payload: {} },
};
