/** What app/ may use of the server: a deliberately small surface. */
import "server-only";

export { authOptions, type SessionUser } from "./auth/options";
export { route, errorResponse } from "./http/route";
export { TesseraError } from "./errors";
export { healthReport } from "./health";
export { currentUser, requirePageRole } from "./auth/page-guard";
export { liveFloorSnapshot, floorplanView, recentAlerts, robotFrameNow } from "./live-floor";
export { appDb as appDbForRoutes } from "./db";
export { registerRobot, RegisterRobotSchema } from "./robots-api";
export { runningFleet } from "./registry";
export { runCommand, actorOf } from "./ops-feed/commands";
export { missionDetail } from "./missions-api";
export { listMissions, MissionListQuery, missionEvents, EventPageQuery, exportMissionEvents, type MissionEvent } from "./logbook";
export { replayMission, replayView } from "./fleet/replay";
export { missionIdParam } from "./http/params";
export * from "./facades/floorplans";
export * from "./facades/roster";
export * from "./facades/crew";
export * from "./facades/logbook-extras";
export * from "./facades/reports";
