import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunFile } from "@/lib/db/queries/run-views";
import { attachment } from "@/lib/http/content-disposition";
import { AppError } from "@/lib/http/errors";
import { verifiedStream } from "@/lib/ingest/verified-stream";
import { openStoredFile } from "@/lib/uploads/storage";

const idParam = z.uuid();

function contentType(fileName: string): string {
  if (/\.csv$/i.test(fileName)) return "text/csv";
  if (/\.tsv$/i.test(fileName)) return "text/tab-separated-values";
  if (/\.txt$/i.test(fileName)) return "text/plain";
  return "application/octet-stream";
}

/**
 * GET /api/runs/:id/raw — the untouched bytes as uploaded. They are re-hashed on the way out and
 * the download breaks off if they no longer match the SHA-256 recorded at upload.
 */
export const GET = defineRoute(
  "run.read",
  z.object({}),
  async ({ params }) => {
    const id = idParam.safeParse(params.id);
    if (!id.success) throw new AppError("not-found", "No run has this id.");
    const file = await getRunFile(id.data);
    if (!file) throw new AppError("not-found", "No run has this id.");
    const stored = await openStoredFile(file.fileKey);
    if (!stored.body) throw new AppError("not-found", "The stored file is missing from the upload service.");
    const body = verifiedStream(stored.body, file.sha256, (actual) =>
      console.error(`Raw file of run ${id.data} (${file.fileKey}) hashes to ${actual}, recorded ${file.sha256}: download broken off`),
    );
    return new Response(body, {
      headers: {
        "content-type": contentType(file.fileName),
        "content-length": String(file.fileSize),
        "content-disposition": attachment(file.fileName),
        // RFC 9530 digest of the representation, so clients can check it themselves.
        "repr-digest": `sha-256=:${Buffer.from(file.sha256, "hex").toString("base64")}:`,
        "cache-control": "private, no-store",
      },
    });
  },
  { auth: "session-or-token" },
);
