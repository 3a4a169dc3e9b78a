export * from "./robot-link";
export * from "./ops-feed";
export * from "./what-if";
export * from "./notes";
export * from "./floorplans";
