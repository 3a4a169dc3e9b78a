export * from "./types";
export * from "./plan";
export * from "./parse";
export * from "./json";
