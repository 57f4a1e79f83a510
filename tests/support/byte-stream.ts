/** A text or byte array as a web byte stream in pieces of `piece` bytes, so line and chunk boundaries fall anywhere. */
export function streamInPieces(data: string | Uint8Array, piece: number): ReadableStream<Uint8Array> {
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  let at = 0;
  return new ReadableStream<Uint8Array>({
    pull(c) {
      if (at >= bytes.length) return c.close();
      c.enqueue(bytes.slice(at, at + piece));
      at += piece;
    },
  });
}
