/** What app/ uses of the server for roster; re-exported by server/facade.ts. */
export {};
