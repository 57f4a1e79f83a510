/**
 * The byte stream: reading a bounded head for detection, replaying it in front
 * of the rest, and turning UTF-16 into UTF-8 so every later stage sees bytes in
 * an ASCII-compatible encoding.
 */
import { headMaxBytes, headMinBytes, headMinLines } from "./limits";

export interface Head {
  /** The first bytes of the stream (a copy), at least headMinBytes unless the stream is shorter. */
  bytes: Uint8Array;
  /** True when the head is the whole stream. */
  complete: boolean;
  /** The chunks of the head followed by the rest of the stream, each byte exactly once. */
  stream: AsyncIterable<Uint8Array>;
}

function countNewlines(chunk: Uint8Array): number {
  let n = 0;
  for (let p = chunk.indexOf(10); p >= 0; p = chunk.indexOf(10, p + 1)) n++;
  return n;
}

function concat(chunks: readonly Uint8Array[], total: number): Uint8Array {
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

export async function readHead(source: AsyncIterable<Uint8Array>): Promise<Head> {
  const iterator = source[Symbol.asyncIterator]();
  const chunks: Uint8Array[] = [];
  let total = 0;
  let lines = 0;
  let complete = false;
  while (total < headMaxBytes && (total < headMinBytes || lines < headMinLines)) {
    const next = await iterator.next();
    if (next.done) {
      complete = true;
      break;
    }
    // Copy: a producer may reuse its buffer once we ask for the next chunk.
    const chunk = new Uint8Array(next.value);
    chunks.push(chunk);
    total += chunk.length;
    lines += countNewlines(chunk);
  }
  const stream: AsyncIterable<Uint8Array> = {
    async *[Symbol.asyncIterator]() {
      yield* chunks;
      if (complete) return;
      for (;;) {
        const next = await iterator.next();
        if (next.done) return;
        yield next.value;
      }
    },
  };
  return { bytes: concat(chunks, total), complete, stream };
}

export type TextEncodingName = "utf-8" | "windows-1252" | "utf-16le" | "utf-16be";

export interface ByteVerdict {
  encoding: TextEncodingName;
  /** Why the bytes are not text, when they are not. */
  binary: string | null;
}

function looksUtf16(bytes: Uint8Array, zeroAt: 0 | 1): boolean {
  const pairs = Math.floor(Math.min(bytes.length, 4096) / 2);
  if (pairs < 4) return false;
  let zeros = 0;
  for (let k = 0; k < pairs; k++) if (bytes[2 * k + zeroAt] === 0 && bytes[2 * k + 1 - zeroAt] !== 0) zeros++;
  return zeros / pairs > 0.9;
}

/** Counts bytes that are not part of a well-formed UTF-8 sequence (RFC 3629). */
export function invalidUtf8Bytes(bytes: Uint8Array): number {
  let invalid = 0;
  let p = 0;
  while (p < bytes.length) {
    const b = bytes[p]!;
    if (b < 0x80) {
      p++;
      continue;
    }
    const need = b >= 0xc2 && b <= 0xdf ? 1 : b >= 0xe0 && b <= 0xef ? 2 : b >= 0xf0 && b <= 0xf4 ? 3 : 0;
    if (need === 0) {
      invalid++;
      p++;
      continue;
    }
    // A sequence cut by the end of the head is not evidence either way.
    if (p + need >= bytes.length) break;
    let ok = true;
    for (let k = 1; k <= need; k++) if (((bytes[p + k] ?? 0) & 0xc0) !== 0x80) ok = false;
    if (ok) p += need + 1;
    else {
      invalid++;
      p++;
    }
  }
  return invalid;
}

/**
 * Text or not, and which encoding. NUL bytes and other control characters mean
 * binary. Invalid UTF-8 in a small share of bytes means a legacy 8-bit file
 * (a Latin-1 "°" in a header); in a large share, binary.
 */
export function judgeBytes(whole: Uint8Array): ByteVerdict {
  const head = whole.subarray(0, 256 * 1024);
  if (head[0] === 0xff && head[1] === 0xfe) return { encoding: "utf-16le", binary: null };
  if (head[0] === 0xfe && head[1] === 0xff) return { encoding: "utf-16be", binary: null };
  if (looksUtf16(head, 1)) return { encoding: "utf-16le", binary: null };
  if (looksUtf16(head, 0)) return { encoding: "utf-16be", binary: null };
  let nul = 0;
  let control = 0;
  for (const b of head) {
    if (b === 0) nul++;
    else if (b < 9 || (b > 13 && b < 32) || b === 127) control++;
  }
  if (nul > 0) return { encoding: "utf-8", binary: `it contains ${nul} NUL byte${nul === 1 ? "" : "s"} in its first ${head.length} bytes` };
  if (control > head.length * 0.01)
    return { encoding: "utf-8", binary: `${control} of its first ${head.length} bytes are control characters` };
  const invalid = invalidUtf8Bytes(head);
  if (invalid === 0) return { encoding: "utf-8", binary: null };
  if (invalid > head.length * 0.1)
    return { encoding: "utf-8", binary: `${invalid} of its first ${head.length} bytes are not valid text` };
  return { encoding: "windows-1252", binary: null };
}

/** UTF-16 in, UTF-8 out, in bounded pieces. */
export async function* transcodeToUtf8(source: AsyncIterable<Uint8Array>, encoding: "utf-16le" | "utf-16be"): AsyncGenerator<Uint8Array> {
  const decoder = new TextDecoder(encoding);
  const encoder = new TextEncoder();
  for await (const chunk of source) {
    const text = decoder.decode(chunk, { stream: true });
    if (text.length > 0) yield encoder.encode(text);
  }
  const tail = decoder.decode();
  if (tail.length > 0) yield encoder.encode(tail);
}
