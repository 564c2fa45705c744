import type { ReactNode } from 'react';

const URL_PATTERN = /\bhttps?:\/\/[^\s<>"']+/g;
// Sentence punctuation that usually follows a link rather than belonging to it.
const TRAILING = /[.,;:!?)\]]+$/;

export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

/** Splits plain text into text and http(s) links; nothing else (javascript:, data:) becomes a link. */
export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    let href = match[0];
    const trailing = TRAILING.exec(href);
    if (trailing) href = href.slice(0, -trailing[0].length);
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', href });
    last = start + href.length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}

export function LinkifiedText({ text }: { text: string }): ReactNode {
  return splitLinks(text).map((part, index) =>
    part.kind === 'link' ? (
      <a key={index} href={part.href} className="break-all text-accent-700 underline hover:text-accent-800" rel="noreferrer">
        {part.href}
      </a>
    ) : (
      <span key={index}>{part.text}</span>
    ),
  );
}
