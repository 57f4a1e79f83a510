import { openAsBlob } from "node:fs";
import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunHeader } from "@/lib/db/queries/run-views";
import { assertCellUsable, DuplicateRun, findRunByHash } from "@/lib/db/queries/runs";
import { AppError } from "@/lib/http/errors";
import { runJson } from "@/lib/ingest/api-json";
import { admitStoredFile, columnMapOf, runFields } from "@/lib/ingest/intake";
import { receiveLogUpload } from "@/lib/ingest/multipart";
import { fieldErrorsOf } from "@/lib/auth/action";
import { uploadEnv } from "@/lib/uploads/env";
import { storeFile } from "@/lib/uploads/storage";
import { isAcceptedLogFile, maxLogBytes, runUploadInput } from "@/lib/validations/runs";

async function conflict(error: DuplicateRun): Promise<Response> {
  const existing = await getRunHeader(error.runId);
  return Response.json({ error: error.message, code: error.code, runId: error.runId, run: existing ? runJson(existing) : null }, { status: 409 });
}

/**
 * POST /api/v1/runs — multipart: `file` plus the upload form's fields (cellSerial, purpose,
 * ambientTempC, testEndedAt as ISO 8601 with its offset, operatorNote, columnMapId or columnMap as JSON, batchId/cellTypeId for a new
 * cell). Stored through the upload service and analysed like a browser upload.
 * 202 with the queued run; 409 with the existing run for byte-identical bytes; 413 when too large.
 */
export const POST = defineRoute(
  "run.upload",
  z.object({}),
  async ({ user, request }) => {
    uploadEnv();
    const upload = await receiveLogUpload(request, maxLogBytes);
    try {
      const parsed = runUploadInput.safeParse(upload.fields);
      if (!parsed.success) throw new AppError("bad-request", "Some fields need attention.", { fieldErrors: fieldErrorsOf(parsed.error) });
      const { file } = upload;
      if (!isAcceptedLogFile(file)) throw new AppError("bad-request", `${file.name} is not a CSV or text log (.csv, .txt, .tsv).`, { fieldErrors: { file: ["Send a CSV or text log"] } });
      const fields = runFields(parsed.data, user, await columnMapOf(parsed.data));
      await assertCellUsable(fields.cellSerial, fields.newCell, fields.mayCreateCell);
      // Refuse a duplicate before its bytes go to storage.
      const existing = await findRunByHash(fields.cellSerial, file.sha256);
      if (existing) throw new DuplicateRun(existing.runId, existing.serial);
      const stored = await storeFile(await openAsBlob(file.path, { type: file.type }), file.name, file.type);
      const admitted = await admitStoredFile({ key: stored.key, name: file.name, size: file.size }, fields, "api", user, file.sha256);
      const header = await getRunHeader(admitted.runId);
      if (!header) throw new Error("the new run vanished");
      return Response.json({ run: runJson(header) }, { status: 202, headers: { location: `/api/v1/runs/${admitted.runId}` } });
    } catch (error) {
      if (error instanceof DuplicateRun) return conflict(error);
      throw error;
    } finally {
      await upload.cleanup();
    }
  },
  { auth: "session-or-token" },
);
