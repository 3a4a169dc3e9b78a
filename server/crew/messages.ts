/** The text and HTML of the crew's e-mails; every inserted value is escaped in the HTML part. */
import type { OutgoingMail } from "../mail/mailer";

function escapeHtml(value: string): string {
  return value.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function html(paragraphs: string[], link: { url: string; label: string }): string {
  const body = paragraphs.map((p) => `<p>${escapeHtml(p)}</p>`).join("\n");
  return `<!doctype html><html><body style="font-family:sans-serif;line-height:1.5">\n${body}\n<p><a href="${escapeHtml(link.url)}">${escapeHtml(link.label)}</a></p>\n<p style="color:#666">${escapeHtml(link.url)}</p>\n</body></html>`;
}

export function inviteMail(to: { email: string; name: string }, role: string, invitedBy: string, url: string): OutgoingMail {
  const lines = [
    `Hello ${to.name},`,
    `${invitedBy} has added you to Tessera's crew as ${role}. Open the link below within 72 hours to set your password; it works once.`,
  ];
  return {
    to: to.email,
    subject: "You are invited to Tessera",
    text: `${lines.join("\n\n")}\n\n${url}\n\nIf you did not expect this, ignore this message.\n`,
    html: html([...lines, "If you did not expect this, ignore this message."], { url, label: "Set your password" }),
  };
}

export function resetMail(to: { email: string; name: string }, url: string): OutgoingMail {
  const lines = [`Hello ${to.name},`, "Someone asked to reset the password of your Tessera account. Open the link below within an hour to choose a new one; it works once."];
  return {
    to: to.email,
    subject: "Reset your Tessera password",
    text: `${lines.join("\n\n")}\n\n${url}\n\nIf you did not ask for this, ignore this message: your password stays as it is.\n`,
    html: html([...lines, "If you did not ask for this, ignore this message: your password stays as it is."], { url, label: "Choose a new password" }),
  };
}
