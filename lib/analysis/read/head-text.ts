import { maxLineBytes } from "./limits";

/** The head as physical lines, numbered as both parsing paths number them. */
export interface HeadLines {
  lines: string[];
  /** 10 for LF and CRLF files, 13 for lone CR. */
  newline: number;
}

export function headLines(bytes: Uint8Array, complete: boolean, encoding: string): HeadLines {
  let text = new TextDecoder(encoding).decode(bytes);
  const newline = text.includes("\n") || !text.includes("\r") ? 10 : 13;
  const nl = String.fromCharCode(newline);
  if (!complete) {
    // The last line may be cut in the middle: leave it to the parsing path, unless it is already
    // longer than any log line, so the sniffer names that line instead of finding no data rows.
    const cut = text.lastIndexOf(nl);
    if (cut >= 0 && text.length - cut - 1 <= maxLineBytes) text = text.slice(0, cut + 1);
  }
  const lines = text.split(nl);
  if (lines.length > 0 && lines.at(-1) === "") lines.pop();
  return { lines: newline === 10 ? lines.map((l) => (l.endsWith("\r") ? l.slice(0, -1) : l)) : lines, newline };
}
