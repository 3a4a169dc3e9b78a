export * from "./model";
export * from "./transitions";
export * from "./update";
