/** A piece of a plain-text mail body: text, or a link to show as one. */
export interface MailSegment {
  readonly text: string;
  /** Set for an http(s) address; the text is the address itself. */
  readonly href?: string;
}

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
/** Sentence punctuation right after an address is not part of it. */
const TRAILING = /[.,;:!?)\]]+$/;

/**
 * Splits a plain-text mail into text and http(s) links, so the page can make
 * the links clickable without ever treating the mail as HTML.
 */
export function splitMailLinks(body: string): MailSegment[] {
  const segments: MailSegment[] = [];
  let last = 0;
  for (const match of body.matchAll(URL_PATTERN)) {
    const start = match.index;
    const href = match[0].replace(TRAILING, '');
    if (start > last) segments.push({ text: body.slice(last, start) });
    segments.push({ text: href, href });
    last = start + href.length;
  }
  if (last < body.length) segments.push({ text: body.slice(last) });
  return segments;
}
