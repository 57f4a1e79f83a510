import { POST as postRun } from "@/app/api/v1/runs/route";
import { GET as getRun } from "@/app/api/v1/runs/[id]/route";
import { GET as getCellRuns } from "@/app/api/v1/cells/[serial]/runs/route";
import { GET as getRaw } from "@/app/api/runs/[id]/raw/route";

export type Auth = { token: string } | { headers: Headers } | null;

function headersOf(auth: Auth): Headers {
  if (!auth) return new Headers();
  if ("token" in auth) return new Headers({ authorization: `Bearer ${auth.token}` });
  return new Headers(auth.headers);
}

const origin = "http://localhost:3000";

/** POST /api/v1/runs as curl would send it: multipart with the log in `file`. */
export function postLog(auth: Auth, fields: Record<string, string>, file: { name: string; text: string | Uint8Array<ArrayBuffer>; type?: string }, extraHeaders: Record<string, string> = {}) {
  const form = new FormData();
  for (const [k, v] of Object.entries(fields)) form.set(k, v);
  form.set("file", new Blob([file.text], { type: file.type ?? "text/csv" }), file.name);
  const headers = headersOf(auth);
  for (const [k, v] of Object.entries(extraHeaders)) headers.set(k, v);
  return postRun(new Request(`${origin}/api/v1/runs`, { method: "POST", headers, body: form }));
}

export function fetchRun(auth: Auth, id: string, search = "") {
  return getRun(new Request(`${origin}/api/v1/runs/${id}${search}`, { headers: headersOf(auth) }), { params: Promise.resolve({ id }) });
}

export function fetchCellRuns(auth: Auth, serial: string) {
  return getCellRuns(new Request(`${origin}/api/v1/cells/${encodeURIComponent(serial)}/runs`, { headers: headersOf(auth) }), { params: Promise.resolve({ serial }) });
}

export function fetchRaw(auth: Auth, id: string) {
  return getRaw(new Request(`${origin}/api/runs/${id}/raw`, { headers: headersOf(auth) }), { params: Promise.resolve({ id }) });
}
