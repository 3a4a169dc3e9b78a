/** What app/ uses of the server for roster; re-exported by server/facade.ts. */
export {
  floorplanChoices,
  listRoster,
  parseRobotSettings,
  pushRobotGains,
  resetRobotSettings,
  retireRobot,
  robotDetail,
  robotSettings,
  rotateRobotKey,
  saveRobotSettings,
  type RobotDetail,
  type RosterEntry,
  type SettingsView,
} from "../roster";
