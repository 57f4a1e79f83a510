import type { NextRequest } from "next/server";
import { GET, POST } from "@/app/api/uploadthing/route";
import type { BenchLogInput } from "@/lib/validations/runs";
import type { PresignedUpload } from "../../fakes/support/browser-upload";
import { serveWebHandler } from "../../fakes/support/serve-web-handler";

/** Our real file route on a local port, so the upload fake can post callbacks to it. */
export async function serveFileRoute(): Promise<{ routeUrl: string; close(): Promise<void> }> {
  const app = await serveWebHandler((request) => (request.method === "GET" ? GET(request as NextRequest) : POST(request as NextRequest)));
  return { routeUrl: `${app.url}/api/uploadthing`, close: app.close };
}

/** The upload client's first request (what `uploadthing/client` sends), with the form's input. */
export async function requestUpload(routeUrl: string, files: File[], input: BenchLogInput, headers: Headers): Promise<Response> {
  const url = new URL(routeUrl);
  url.searchParams.set("actionType", "upload");
  url.searchParams.set("slug", "benchLog");
  const sent = new Headers(headers);
  sent.set("content-type", "application/json");
  sent.set("x-uploadthing-package", "kneepoint-test");
  return fetch(url, {
    method: "POST",
    headers: sent,
    body: JSON.stringify({ input, files: files.map((f) => ({ name: f.name, size: f.size, type: f.type, lastModified: f.lastModified })) }),
  });
}

export async function presignedUploads(routeUrl: string, files: File[], input: BenchLogInput, headers: Headers): Promise<PresignedUpload[]> {
  const response = await requestUpload(routeUrl, files, input, headers);
  if (!response.ok) throw new Error(`upload request refused: HTTP ${response.status} ${await response.text()}`);
  return (await response.json()) as PresignedUpload[];
}
