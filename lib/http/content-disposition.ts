/** RFC 6266: a download's file name as a plain ASCII fallback plus the exact name in RFC 5987 encoding. */
export function attachment(fileName: string): string {
  const fallback = fileName.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return `attachment; filename="${fallback}"; filename*=UTF-8''${encodeURIComponent(fileName)}`;
}
