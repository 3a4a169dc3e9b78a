export * from "./solve-mdp";
export * from "./shortest-turns";
export * from "./plan-policy";
export * from "./choose-action";
export * from "./dual-mode";
export * from "./give-way";
