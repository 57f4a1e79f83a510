import "server-only";
import { AsyncLocalStorage } from "node:async_hooks";

/**
 * Where server actions read the request's headers from. Inside Next.js that is `next/headers`;
 * tests and scripts that call an action directly supply real headers (with a real session cookie)
 * through `withRequestHeaders`, so the same session check runs in both.
 */
const explicit = new AsyncLocalStorage<Headers>();

export function withRequestHeaders<T>(headers: Headers, fn: () => Promise<T>): Promise<T> {
  return explicit.run(headers, fn);
}

export async function requestHeaders(): Promise<Headers> {
  const given = explicit.getStore();
  if (given) return given;
  const { headers } = await import("next/headers");
  return new Headers(await headers());
}
