/** Tessera's pure estimation and planning library. Outside checks import from here. */
export * from "./vocabulary";
export * from "./roles";
export * from "./floorplan";
export * from "./belief";
export * from "./motion";
export * from "./sensing";
export * from "./planning";
export * from "./control";
export * from "./kinematics";
export * from "./protocol";
export * from "./roster";
