import { listCaughtMail, MailListQuery, route } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "admin", surface: "mail", query: MailListQuery }, async ({ query }) => listCaughtMail(query));
