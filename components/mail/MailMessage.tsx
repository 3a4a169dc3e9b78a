import type { CaughtMail } from "@/lib/crew/schemas";
import { formatUtc } from "../admin/when";
import { linkifyText } from "./linkify";

/** One caught message: headers, the text part with clickable links, and the HTML part in a script-free frame. */
export function MailMessage({ mail }: { mail: CaughtMail }) {
  return (
    <article aria-label={mail.subject} className="rounded-lg border border-ink-700 bg-ink-900 p-4">
      <header className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="font-semibold">{mail.subject}</h2>
        <span className="font-mono text-xs text-ink-500">{formatUtc(mail.receivedAt)} UTC</span>
      </header>
      <dl className="mt-1 grid grid-cols-[4rem_1fr] gap-x-2 text-xs text-ink-300">
        <dt className="text-ink-500">From</dt>
        <dd className="font-mono">{mail.from}</dd>
        <dt className="text-ink-500">To</dt>
        <dd className="font-mono">{mail.to.join(", ")}</dd>
      </dl>
      {mail.text && (
        <p className="mt-3 whitespace-pre-wrap break-words text-sm text-ink-100">
          {linkifyText(mail.text).map((part, i) =>
            part.kind === "link" ? (
              <a key={i} href={part.url} className="break-all text-tide underline underline-offset-2">
                {part.url}
              </a>
            ) : (
              <span key={i}>{part.text}</span>
            ),
          )}
        </p>
      )}
      {mail.html && (
        <details className="mt-3 text-sm">
          <summary className="cursor-pointer text-ink-500">HTML part</summary>
          <iframe title={`HTML part of ${mail.subject}`} sandbox="" srcDoc={mail.html} className="mt-2 h-64 w-full rounded border border-ink-700 bg-white" />
        </details>
      )}
    </article>
  );
}
