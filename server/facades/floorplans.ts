/** What app/ uses of the server for floorplans; re-exported by server/facade.ts. */
export {};
