export * from "./robot-link";
export * from "./ops-feed";
export * from "./floorplans";
