/** A new user's first minute: sign in, see the shell, meet the role fences. */
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { withBrowser } from "../support/browser";

const appUrl = inject("appUrl");

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${appUrl}/floor`);
  await page.waitForURL(/\/sign-in/);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

describe("sign-in", () => {
  it("takes the operator from the sign-in page to the live floor shell", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await signIn(page, "operator@tessera.test", "demo-tessera");
      await page.waitForURL(`${appUrl}/floor`);
      const user = page.getByTestId("signed-in-user");
      await user.waitFor();
      expect(await user.innerText()).toContain("operator");
      const nav = await page.getByRole("navigation", { name: "Main" }).innerText();
      expect(nav).toContain("Live floor");
      expect(nav).toContain("Logbook");
      expect(nav).not.toContain("Crew");
    });
  });

  it("shows a clear error for a wrong password and stays on the sign-in page", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await signIn(page, "operator@tessera.test", "not-the-password");
      // Next's route announcer is also role=alert; ours is the one with text.
      const alert = page.getByRole("alert").filter({ hasText: /\S/ });
      await alert.waitFor();
      expect(await alert.innerText()).toMatch(/do not match an active Tessera account/);
      expect(page.url()).toContain("/sign-in");
    });
  });

  it("answers a viewer on an admin page with a 403 page", async () => {
    await withBrowser(async (context) => {
      const page = await context.newPage();
      await signIn(page, "viewer@tessera.test", "demo-tessera");
      await page.waitForURL(`${appUrl}/floor`);
      const response = await page.goto(`${appUrl}/crew`);
      expect(response?.status()).toBe(403);
      expect(await page.getByRole("heading", { level: 1 }).innerText()).toMatch(/role you do not have/);
    });
  });
});
