export * from "./pid";
