export * from "./normalise";
export * from "./belief";
export * from "./filter";
