/**
 * Does over fetch what `uploadthing/client` does in a browser (`uploadFilesInternal` and
 * `uploadWithProgress` in `uploadthing/client/index.js`), since node has no XMLHttpRequest.
 */
export interface PresignedUpload {
  url: string;
  key: string;
  name: string;
  customId: string | null;
}

export interface BrowserUploadResult {
  presigned: PresignedUpload;
  rangeStart: number;
  putStatus: number;
  putBody: Record<string, unknown>;
}

export async function requestPresignedUrls(
  routeUrl: string,
  slug: string,
  files: File[],
  headers: Record<string, string> = {},
): Promise<PresignedUpload[]> {
  const url = new URL(routeUrl);
  url.searchParams.set("actionType", "upload");
  url.searchParams.set("slug", slug);
  const response = await fetch(url, {
    method: "POST",
    headers: { ...headers, "content-type": "application/json", "x-uploadthing-package": "kneepoint-test" },
    body: JSON.stringify({ input: null, files: files.map((f) => ({ name: f.name, size: f.size, type: f.type, lastModified: f.lastModified })) }),
  });
  if (!response.ok) throw new Error(`upload action failed: HTTP ${response.status} ${await response.text()}`);
  return (await response.json()) as PresignedUpload[];
}

export async function putToPresigned(presigned: PresignedUpload, file: File): Promise<BrowserUploadResult> {
  const head = await fetch(presigned.url, { method: "HEAD" });
  if (!head.ok) throw new Error(`HEAD failed: HTTP ${head.status}`);
  const rangeStart = Number.parseInt(head.headers.get("x-ut-range-start") ?? "0", 10);
  const form = new FormData();
  form.append("file", rangeStart > 0 ? file.slice(rangeStart) : file);
  const put = await fetch(presigned.url, { method: "PUT", headers: { Range: `bytes=${rangeStart}-` }, body: form });
  return { presigned, rangeStart, putStatus: put.status, putBody: (await put.json()) as Record<string, unknown> };
}
