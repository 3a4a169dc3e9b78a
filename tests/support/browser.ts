/** Debian's chromium under playwright-core; each test gets a fresh profile. */
import { mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { chromium, type BrowserContext } from "playwright-core";

export async function withBrowser<T>(run: (context: BrowserContext) => Promise<T>): Promise<T> {
  const profile = mkdtempSync(path.join(tmpdir(), "tessera-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: "/usr/bin/chromium",
    headless: true,
    args: ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"],
  });
  try {
    return await run(context);
  } finally {
    await context.close();
    rmSync(profile, { recursive: true, force: true });
  }
}
