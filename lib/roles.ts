/** Role ranks: each role may do everything the roles before it may. */
import { ROLES, type Role } from "./vocabulary";

/** True when `have` is at least `need` in the order viewer < operator < admin. */
export function roleAllows(have: Role, need: Role): boolean {
  return ROLES.indexOf(have) >= ROLES.indexOf(need);
}
