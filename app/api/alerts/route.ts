import { recentAlerts, route, appDbForRoutes } from "@/server/facade";

export const dynamic = "force-dynamic";

export const GET = route({ role: "viewer", surface: "alerts" }, async () => ({ alerts: await recentAlerts(appDbForRoutes()) }));
