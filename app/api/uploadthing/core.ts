import "server-only";
import { createUploadthing, type FileRouter } from "uploadthing/next";
import { UploadThingError } from "uploadthing/server";
import { can } from "@/lib/auth/roles";
import { sessionFromHeaders } from "@/lib/auth/session";
import { assertCellUsable, DuplicateRun } from "@/lib/db/queries/runs";
import { AppError } from "@/lib/http/errors";
import { admitStoredFile, columnMapOf, runFields } from "@/lib/ingest/intake";
import { uploadEnv } from "@/lib/uploads/env";
import { benchLogInput, isAcceptedLogFile, logMimeTypes, maxLogFilesPerUpload } from "@/lib/validations/runs";

const f = createUploadthing();

// The SDK counts files per MIME type; the middleware caps the total.
const perType = { maxFileSize: "256MB", maxFileCount: maxLogFilesPerUpload } as const;
const logTypes = Object.fromEntries(logMimeTypes.map((type) => [type, perType])) as Record<(typeof logMimeTypes)[number], typeof perType>;

function refusal(error: unknown): UploadThingError {
  if (error instanceof AppError) {
    const code = error.status === 403 || error.status === 401 ? "FORBIDDEN" : error.status === 404 ? "NOT_FOUND" : "BAD_REQUEST";
    return new UploadThingError({ code, message: error.message });
  }
  return new UploadThingError({ code: "INTERNAL_SERVER_ERROR", message: "The upload could not be prepared.", cause: error });
}

/** What the browser gets back per file once the server has recorded it. */
export type BenchLogServerData =
  | { outcome: "queued"; runId: string; serial: string }
  | { outcome: "duplicate"; runId: string; message: string }
  | { outcome: "refused"; runId: null; message: string };

export const benchFileRouter = {
  /** Bench logs (CSV/TXT/TSV) for one cell, up to 256 MB each, several at once. */
  benchLog: f(logTypes, { awaitServerData: true })
    .input(benchLogInput)
    .middleware(async ({ req, input, files }) => {
      uploadEnv();
      // The route handler wrapper answered 401/403 already; this is the check the SDK itself enforces.
      const user = await sessionFromHeaders(req.headers);
      if (!user || !can(user.role, "run.upload")) throw new UploadThingError({ code: "FORBIDDEN", message: "Your role does not allow uploading bench logs." });
      if (files.length > maxLogFilesPerUpload) throw new UploadThingError({ code: "BAD_REQUEST", message: `At most ${maxLogFilesPerUpload} files at once.` });
      const odd = files.find((file) => !isAcceptedLogFile(file));
      if (odd) throw new UploadThingError({ code: "BAD_REQUEST", message: `${odd.name} is not a CSV or text log (.csv, .txt, .tsv).` });
      try {
        const fields = runFields(input, user, await columnMapOf(input));
        await assertCellUsable(fields.cellSerial, fields.newCell, fields.mayCreateCell);
        // The metadata travels through the upload service and comes back signed with the callback.
        return { userId: user.id, userName: user.name, fields };
      } catch (error) {
        throw refusal(error);
      }
    })
    .onUploadError(({ error, fileKey }) => {
      console.warn(`Upload of ${fileKey} failed: ${error.message}`);
    })
    .onUploadComplete(async ({ metadata, file }): Promise<BenchLogServerData> => {
      // Never throw here: the SDK would then never answer the upload service, and the browser would wait.
      try {
        const admitted = await admitStoredFile({ key: file.key, name: file.name, size: file.size }, metadata.fields, "browser", {
          id: metadata.userId,
          name: metadata.userName,
        });
        return { outcome: "queued", runId: admitted.runId, serial: admitted.serial };
      } catch (error) {
        if (error instanceof DuplicateRun) return { outcome: "duplicate", runId: error.runId, message: error.message };
        if (error instanceof AppError) return { outcome: "refused", runId: null, message: error.message };
        console.error(`Recording upload ${file.key} failed`, error);
        return { outcome: "refused", runId: null, message: "The file was stored but could not be recorded; the error was logged." };
      }
    }),
} satisfies FileRouter;

export type BenchFileRouter = typeof benchFileRouter;
