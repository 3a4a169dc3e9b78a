/**
 * Where the digest gets its mail sender: the process's mailer (a real provider, or the
 * built-in catcher that /mail shows), one copy per on-call address.
 */
import { TesseraError } from "../errors";
import { sendEach } from "../mail/mailer";

export interface MailMessage {
  to: string[];
  subject: string;
  text: string;
  html: string;
}

export type MailSender = (message: MailMessage) => Promise<void>;

/** The process's mail sender; an SMTP failure becomes a 503 that says the digest was not sent. */
export function mailSender(): MailSender {
  return async (message) => {
    try {
      await sendEach(message);
    } catch (cause) {
      throw new TesseraError("unavailable", "digest", "The mail server did not take the digest, so it was not sent; the server log has the reason.", { cause });
    }
  };
}
