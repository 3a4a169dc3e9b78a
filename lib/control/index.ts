export * from "./pid";
export * from "./gains";
