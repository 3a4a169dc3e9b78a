import { describe, expect, it } from "vitest";
import { linkifyText } from "../../components/mail/linkify";

describe("linkifyText", () => {
  it("splits a message into text and links, leaving sentence punctuation outside the link", () => {
    expect(linkifyText("Open http://127.0.0.1:3000/invite/abc_-9. Then sign in (https://x.test/a?b=1).")).toEqual([
      { kind: "text", text: "Open " },
      { kind: "link", url: "http://127.0.0.1:3000/invite/abc_-9" },
      { kind: "text", text: ". Then sign in (" },
      { kind: "link", url: "https://x.test/a?b=1" },
      { kind: "text", text: ")." },
    ]);
  });

  it("leaves text without links, and other schemes, as text", () => {
    expect(linkifyText("javascript:alert(1) and ftp://files.test")).toEqual([{ kind: "text", text: "javascript:alert(1) and ftp://files.test" }]);
    expect(linkifyText("")).toEqual([]);
  });
});
