export * from "./model";
export * from "./beam";
export * from "./ray-cast";
export * from "./update";
