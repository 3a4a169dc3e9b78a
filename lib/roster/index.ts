export * from "./settings";
export * from "./register";
export * from "./views";
