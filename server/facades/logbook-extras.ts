/** What app/ uses of the server for logbook-extras; re-exported by server/facade.ts. */
export {};
