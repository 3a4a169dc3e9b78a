/** Splits a plain-text mail body into text and http(s) links, so the sent-mail page can make links clickable. */
export type TextPart = { kind: "text"; text: string } | { kind: "link"; url: string };

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
/** Sentence punctuation right after a link belongs to the sentence, not the address. */
const TRAILING = /[.,;:!?)\]]+$/;

export function linkifyText(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const url = match[0].replace(TRAILING, "");
    const start = match.index;
    if (start > last) parts.push({ kind: "text", text: text.slice(last, start) });
    parts.push({ kind: "link", url });
    last = start + url.length;
  }
  if (last < text.length) parts.push({ kind: "text", text: text.slice(last) });
  return parts;
}
