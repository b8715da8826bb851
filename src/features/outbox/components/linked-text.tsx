import type { ReactNode } from "react";

const URL_PATTERN = /https?:\/\/[^\s<>"'()]+/g;
const TRAILING_PUNCTUATION = /[.,;:!?]+$/;

/**
 * Plain mail text with its http(s) addresses made clickable. Only http and https become links,
 * so a mail cannot smuggle in a `javascript:` URL.
 */
export function LinkedText({ text }: { text: string }) {
  const parts: ReactNode[] = [];
  let last = 0;
  for (const match of text.matchAll(URL_PATTERN)) {
    const start = match.index ?? 0;
    const raw = match[0];
    const url = raw.replace(TRAILING_PUNCTUATION, "");
    if (start > last) parts.push(text.slice(last, start));
    parts.push(
      <a
        key={start}
        href={url}
        rel="noreferrer"
        className="break-all text-signal-300 underline decoration-signal-600/60 underline-offset-2 hover:text-signal-200"
      >
        {url}
      </a>,
    );
    last = start + url.length;
  }
  if (last < text.length) parts.push(text.slice(last));
  return <>{parts}</>;
}
