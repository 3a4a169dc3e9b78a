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
} from "../roster";
export { isTesseraError } from "../errors";
