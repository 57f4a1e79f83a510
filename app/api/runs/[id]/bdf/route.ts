import { z } from "zod";
import { columnMapSchema } from "@/lib/analysis/types";
import { defineRoute } from "@/lib/auth/route";
import { getRunForExport } from "@/lib/db/queries/run-export";
import { bdfFileName } from "@/lib/export/battery-data-format";
import { bdfStream } from "@/lib/export/bdf-stream";
import { logStartUnixS } from "@/lib/export/bdf-start-time";
import { attachment } from "@/lib/http/content-disposition";
import { AppError } from "@/lib/http/errors";
import { verifiedStream } from "@/lib/ingest/verified-stream";
import { openStoredFile, readStoredHead } from "@/lib/uploads/storage";

const idParam = z.uuid();

// Enough of the head for the first data row below any preamble a bench writes.
const headBytes = 64 * 1024;

/**
 * GET /api/runs/:id/bdf — the run's samples in the Battery Data Format, read from the stored raw
 * file (re-hashed on the way) with the latest analysis' column map and streamed out. A run whose
 * analysis failed answers 409 with the located error, since its file cannot be read as a log.
 */
export const GET = defineRoute(
  "run.read",
  z.object({}),
  async ({ params }) => {
    const id = idParam.safeParse(params.id);
    if (!id.success) throw new AppError("not-found", "No run has this id.");
    const found = await getRunForExport(id.data);
    if (!found) throw new AppError("not-found", "No run has this id.");
    if (found.status === "failed") {
      throw new AppError("conflict", "This run's file could not be read as a log, so it has no samples to export.", {
        details: { located: found.error },
      });
    }
    const map = columnMapSchema.safeParse(found.columnMap);
    const columnMap = map.success ? map.data : undefined;
    const startUnixS = logStartUnixS(await readStoredHead(found.fileKey, headBytes), columnMap);
    const stored = await openStoredFile(found.fileKey);
    if (!stored.body) throw new AppError("not-found", "The stored file is missing from the upload service.");
    const raw = verifiedStream(stored.body, found.sha256, (actual) =>
      console.error(`Raw file of run ${id.data} (${found.fileKey}) hashes to ${actual}, recorded ${found.sha256}: export broken off`),
    );
    const body = bdfStream(raw, {
      read: { fileName: found.fileName, columnMap },
      bdf: { startUnixS, ambientTempC: found.ambientTempC },
      onError: (error) => console.error(`Export of run ${id.data} in the Battery Data Format broke off`, error),
    });
    return new Response(body, {
      headers: {
        "content-type": "text/csv; charset=utf-8",
        "content-disposition": attachment(bdfFileName(found.serial, found.fileName)),
        "cache-control": "private, no-store",
      },
    });
  },
  { auth: "session-or-token" },
);
