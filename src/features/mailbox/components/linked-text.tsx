export type TextPart = { kind: 'text'; text: string } | { kind: 'link'; href: string };

const URL_PATTERN = /https?:\/\/[^\s<>"']+/g;
// sentence punctuation right after a link in prose is not part of it
const TRAILING = /[.,;:!?)\]]+$/;

export function splitLinks(text: string): TextPart[] {
  const parts: TextPart[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const raw = match[0];
    const href = raw.replace(TRAILING, '');
    const start = match.index;
    if (start > last) parts.push({ kind: 'text', text: text.slice(last, start) });
    parts.push({ kind: 'link', href });
    last = start + href.length;
  }
  if (last < text.length) parts.push({ kind: 'text', text: text.slice(last) });
  return parts;
}

export function LinkedText({ text }: { text: string }) {
  return (
    <p className="text-sm leading-relaxed break-words whitespace-pre-wrap text-text">
      {splitLinks(text).map((part, index) =>
        part.kind === 'link' ? (
          <a
            key={index}
            href={part.href}
            className="font-medium break-all text-accent underline underline-offset-2 hover:text-accent-strong focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-accent"
          >
            {part.href}
          </a>
        ) : (
          <span key={index}>{part.text}</span>
        ),
      )}
    </p>
  );
}
