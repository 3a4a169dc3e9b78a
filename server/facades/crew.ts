/** What app/ uses of the server for crew; re-exported by server/facade.ts. */
export {};
