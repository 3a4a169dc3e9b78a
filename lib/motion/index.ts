export * from "./model";
export * from "./transitions";
export * from "./update";
export * from "./carried-out";
