import { AuditQuery, listAudit, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "admin", surface: "audit", query: AuditQuery }, async ({ query }) => listAudit(query));
