"use client";

import { genUploader } from "uploadthing/client";
import type { z } from "zod";
import type { BenchFileRouter, BenchLogServerData } from "@/app/api/uploadthing/core";
import type { benchLogInput } from "@/lib/validations/runs";

const { uploadFiles } = genUploader<BenchFileRouter>({ url: "/api/uploadthing", package: "kneepoint" });

export type BenchLogFields = z.input<typeof benchLogInput>;

/** Raised when the server refuses a stored log as a byte-identical copy of a run it already has. */
export class DuplicateLog extends Error {
  readonly runId: string;
  constructor(message: string, runId: string) {
    super(message);
    this.name = "DuplicateLog";
    this.runId = runId;
  }
}

/**
 * Sends one bench log through our file route (which checks the session and role) to the storage
 * service, reporting progress in percent. Resolves with the id of the run the server queued.
 */
export async function uploadBenchLog(file: File, input: BenchLogFields, onProgress: (percent: number) => void): Promise<string> {
  const [result] = await uploadFiles("benchLog", {
    files: [file],
    input,
    onUploadProgress: ({ progress }) => onProgress(progress),
  });
  const data: BenchLogServerData | undefined = result?.serverData;
  if (!data) throw new Error("The upload finished but the server did not answer for this file.");
  if (data.outcome === "duplicate") throw new DuplicateLog(data.message, data.runId);
  if (data.outcome === "refused") throw new Error(data.message);
  return data.runId;
}
