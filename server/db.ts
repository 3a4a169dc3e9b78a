/** The app's database handle, opened from the configured DATABASE_URL. */
import { openDb, type Db } from "../db/client";
import { config } from "./config";

export function appDb(): Db {
  return openDb(config().DATABASE_URL);
}
