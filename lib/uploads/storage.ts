import "server-only";
import { UTApi, UTFile } from "uploadthing/server";
import { AppError } from "@/lib/http/errors";
import { uploadEnv } from "./env";

/**
 * The raw-file store, reached only through the UploadThing SDK (configured by the environment),
 * so the local fake and the hosted service are interchangeable.
 */
function api(): UTApi {
  uploadEnv();
  return new UTApi({ logLevel: "Error" });
}

/** A short-lived URL from which the stored bytes can be read (works for public and private files). */
export async function storedFileUrl(key: string, expiresInSeconds = 3600): Promise<string> {
  const { ufsUrl } = await api().generateSignedURL(key, { expiresIn: expiresInSeconds });
  return ufsUrl;
}

/** Opens the stored file as a byte stream, optionally only its first `headBytes` bytes. */
export async function openStoredFile(key: string, options: { headBytes?: number; signal?: AbortSignal } = {}): Promise<Response> {
  const url = await storedFileUrl(key);
  const headers: Record<string, string> = {};
  if (options.headBytes !== undefined) headers.range = `bytes=0-${options.headBytes - 1}`;
  const response = await fetch(url, { headers, signal: options.signal });
  if (!response.ok || !response.body) {
    await response.body?.cancel();
    if (response.status === 404) throw new AppError("not-found", "The stored file is missing from the upload service.");
    throw new Error(`Reading stored file ${key} failed: HTTP ${response.status}`);
  }
  return response;
}

/** The first bytes of a stored file (a range request; the whole file when it is shorter). */
export async function readStoredHead(key: string, bytes: number): Promise<Uint8Array> {
  const response = await openStoredFile(key, { headBytes: bytes });
  const buffer = new Uint8Array(await response.arrayBuffer());
  // A server that ignores Range sends everything; keep only the head.
  return buffer.length > bytes ? buffer.subarray(0, bytes) : buffer;
}

/** Stores a file server-side (the bench API path). Returns the service's key. */
export async function storeFile(blob: Blob, name: string, type: string): Promise<{ key: string; size: number }> {
  const result = await api().uploadFiles(new UTFile([blob], name, { type }));
  if (!result.data) throw new Error(`Storing ${name} in the upload service failed: ${result.error.message}`);
  return { key: result.data.key, size: result.data.size };
}

/** Removes a stored file; used when a server-side upload turns out to be a duplicate after all. */
export async function deleteStoredFile(key: string): Promise<void> {
  await api().deleteFiles(key);
}
