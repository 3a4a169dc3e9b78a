export * from "./robot-link";
export * from "./ops-feed";
