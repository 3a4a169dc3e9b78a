/**
 * A newcomer's way in, in the browser: the admin invites them on Crew, opens the invite in
 * Sent mail, the newcomer follows the link in their own browser, sets a password and lands
 * signed in; the admin then finds the invite, the role and the acceptance in Audit.
 */
import type { Page } from "playwright-core";
import { describe, expect, inject, it } from "vitest";
import { withBrowser } from "../support/browser";

const appUrl = inject("appUrl");
const stamp = `${process.pid}${Date.now() % 1_000_000}`;

async function signIn(page: Page, email: string, password: string) {
  await page.goto(`${appUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL(`${appUrl}/floor`);
}

describe("invite", () => {
  it("takes an invite from Crew through Sent mail to the newcomer's first sign-in, and into Audit", async () => {
    const email = `rowan-${stamp}@tessera.test`;
    await withBrowser(async (adminContext) => {
      const page = await adminContext.newPage();
      await signIn(page, "admin@tessera.test", "demo-tessera");
      await page.goto(`${appUrl}/crew`);
      const form = page.getByRole("form", { name: "Invite a user" });
      await form.getByLabel("Name").fill("Rowan Achebe");
      await form.getByLabel("E-mail").fill(email);
      await form.getByLabel("Role").selectOption("operator");
      await form.getByRole("button", { name: "Send invite" }).click();
      await page.getByRole("status").filter({ hasText: `Invite sent to ${email} as operator.` }).waitFor();
      const row = page.getByRole("table", { name: "Crew" }).getByRole("row").filter({ hasText: email });
      expect(await row.innerText()).toContain("Invited");

      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Sent mail" }).click();
      await page.waitForURL(`${appUrl}/mail`);
      const message = page.getByRole("article").filter({ hasText: email }).first();
      expect(await message.getByRole("heading").innerText()).toBe("You are invited to Tessera");
      const link = message.getByRole("link", { name: /\/invite\// });
      const href = await link.getAttribute("href");
      expect(href).toMatch(new RegExp(`^${appUrl}/invite/[A-Za-z0-9_-]{43}$`));

      await withBrowser(async (newcomerContext) => {
        const newcomer = await newcomerContext.newPage();
        await newcomer.goto(href!);
        expect(await newcomer.getByRole("heading", { level: 1 }).innerText()).toBe("Welcome, Rowan Achebe");
        await newcomer.getByLabel("New password").fill("rowan-first-pass");
        await newcomer.getByLabel("Repeat the password").fill("rowan-first-pas");
        await newcomer.getByRole("button", { name: "Set password and sign in" }).click();
        await newcomer.getByText("The two passwords differ.").waitFor();
        await newcomer.getByLabel("Repeat the password").fill("rowan-first-pass");
        await newcomer.getByRole("button", { name: "Set password and sign in" }).click();
        await newcomer.waitForURL(`${appUrl}/floor`);
        const user = newcomer.getByTestId("signed-in-user");
        await user.waitFor();
        expect(await user.innerText()).toMatch(/Rowan Achebe\s+operator/);

        await newcomer.goto(href!);
        expect(await newcomer.getByRole("alert").filter({ hasText: /\S/ }).innerText()).toBe("This link has already been used.");
      });

      await page.goto(`${appUrl}/crew`);
      expect(await page.getByRole("table", { name: "Crew" }).getByRole("row").filter({ hasText: email }).innerText()).toContain("Active");

      await page.goto(`${appUrl}/audit`);
      await page.getByLabel("Action").selectOption("invite");
      await page.getByRole("button", { name: "Show" }).click();
      await page.waitForURL(/action=invite/);
      const invite = page.getByRole("table", { name: "Audit trail" }).getByRole("row").filter({ hasText: email });
      const text = await invite.innerText();
      expect(text).toContain("Ada Okafor");
      expect(text).toContain("role: operator");

      await page.getByLabel("Action").selectOption("invite-accepted");
      await page.getByRole("button", { name: "Show" }).click();
      await page.waitForURL(/action=invite-accepted/);
      const accepted = page.getByRole("table", { name: "Audit trail" }).getByRole("row").filter({ hasText: email });
      expect(await accepted.innerText()).toContain("Rowan Achebe");
    });
  });
});
