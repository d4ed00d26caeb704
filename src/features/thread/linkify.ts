// Splits a message's plain text into text and web-link pieces. Nothing is ever parsed as HTML:
// the pieces are rendered as React text and <a> elements, so "<b>" stays four characters.

export type TextPiece =
  { kind: "text"; text: string } | { kind: "link"; text: string; href: string };

// A URL runs to the next whitespace; angle brackets and quotes end it too, as RFC 3986
// Appendix C suggests for URLs set in running text.
const URL_IN_TEXT = /\bhttps?:\/\/[^\s<>"]+/gi;
// Sentence punctuation right after a URL belongs to the sentence, not the URL; a closing
// bracket stays when the URL opened one itself (…/wiki/Coving_(moulding)).
const TRAILING = /[.,;:!?'’)\]}]/;
const OPENER: Record<string, string> = { ")": "(", "]": "[", "}": "{" };

function count(s: string, ch: string): number {
  return s.split(ch).length - 1;
}

function trimUrl(raw: string): string {
  let url = raw;
  while (url.length > 0) {
    const ch = url[url.length - 1];
    if (!TRAILING.test(ch)) break;
    const opener = OPENER[ch];
    if (opener && count(url, opener) >= count(url, ch)) break;
    url = url.slice(0, -1);
  }
  return url;
}

function safeHref(candidate: string): string | null {
  try {
    const url = new URL(candidate);
    // Only web links: never javascript:, data: or anything else.
    if (url.protocol !== "http:" && url.protocol !== "https:") return null;
    return url.href;
  } catch {
    return null;
  }
}

/** The text with each http(s) URL as its own link piece. */
export function linkify(text: string): TextPiece[] {
  const pieces: TextPiece[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_IN_TEXT)) {
    const raw = trimUrl(match[0]);
    const href = safeHref(raw);
    const start = match.index;
    if (!href) continue;
    if (start > last)
      pieces.push({ kind: "text", text: text.slice(last, start) });
    pieces.push({ kind: "link", text: raw, href });
    last = start + raw.length;
  }
  if (last < text.length) pieces.push({ kind: "text", text: text.slice(last) });
  return pieces;
}
