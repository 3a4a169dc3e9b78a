/** What app/ uses of the server for floorplans; re-exported by server/facade.ts. */
export {
  exportFloorplan,
  floorplanDetail,
  findFloorplanDetail,
  floorplanIdParam,
  floorplanOriginal,
  floorplanSummaries,
  importFloorplanUpload,
  previewFloorplanUpload,
  saveFloorplanVersion,
  type FloorplanDetail,
} from "../floorplans/api";
