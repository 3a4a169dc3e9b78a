import { describe, expect, it } from "vitest";
import { inviteMail, resetMail } from "./messages";

describe("crew e-mails", () => {
  it("puts the link in both parts and escapes names in the HTML part", () => {
    const url = "http://tessera.local:3000/invite/AbC_-123";
    const mail = inviteMail({ email: "kai@tessera.test", name: 'Kai <b>"K"</b>' }, "operator", "Ada & Co", url);
    expect(mail.to).toBe("kai@tessera.test");
    expect(mail.text).toContain(`Hello Kai <b>"K"</b>,`);
    expect(mail.text).toContain(`\n\n${url}\n\n`);
    expect(mail.html).toContain("Hello Kai &lt;b&gt;&quot;K&quot;&lt;/b&gt;,");
    expect(mail.html).toContain("Ada &amp; Co has added you to Tessera&#39;s crew as operator.");
    expect(mail.html).toContain(`<a href="${url}">Set your password</a>`);
    expect(mail.html).not.toContain("<b>");
  });

  it("says how long a reset link lasts", () => {
    const mail = resetMail({ email: "kai@tessera.test", name: "Kai" }, "http://tessera.local:3000/reset/xyz");
    expect(mail.subject).toBe("Reset your Tessera password");
    expect(mail.text).toMatch(/within an hour/);
    expect(mail.html).toContain('<a href="http://tessera.local:3000/reset/xyz">Choose a new password</a>');
  });
});
