"use client";

import { z } from "zod";

// Zod compiles parsers with `new Function`, which the pages' content security policy
// forbids; its probe for that would be reported as a violation on every page. In the
// browser it parses without compiling.
z.config({ jitless: true });

/** Rendered once in the root layout so the setting above runs before any page parses. */
export function ZodJitless() {
  return null;
}
