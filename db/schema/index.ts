export * from "./users";
export * from "./robots";
