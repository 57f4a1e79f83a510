import { isServer, QueryClient } from "@tanstack/react-query";

function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        // Data prefetched on the server must not be refetched the moment the page hydrates.
        staleTime: 30_000,
        retry: (failures, error) => failures < 2 && !(error instanceof ApiError && error.status < 500),
      },
    },
  });
}

let browserClient: QueryClient | undefined;

/** A new client per server request (no data shared between users), one client in the browser. */
export function browserQueryClient(): QueryClient {
  if (isServer) return makeQueryClient();
  browserClient ??= makeQueryClient();
  return browserClient;
}

export class ApiError extends Error {
  readonly status: number;
  readonly fieldErrors?: Record<string, string[]>;
  constructor(status: number, message: string, fieldErrors?: Record<string, string[]>) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.fieldErrors = fieldErrors;
  }
}

/** Fetches JSON from our route handlers and turns error bodies into ApiError. */
export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const response = await fetch(url, { ...init, headers: { accept: "application/json", ...init?.headers } });
  if (!response.ok) {
    let message = `Request failed (${response.status})`;
    let fieldErrors: Record<string, string[]> | undefined;
    try {
      const body = (await response.json()) as { error?: string; fieldErrors?: Record<string, string[]> };
      if (body.error) message = body.error;
      fieldErrors = body.fieldErrors;
    } catch {
      // not JSON: keep the status text
    }
    throw new ApiError(response.status, message, fieldErrors);
  }
  return (await response.json()) as T;
}
