export * from "./users";
export * from "./robots";
export * from "./floorplans";
export * from "./missions";
export * from "./policies";
export * from "./events";
export * from "./alerts";
export * from "./mail";
