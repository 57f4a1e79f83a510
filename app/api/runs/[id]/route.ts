import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { getRunHeader } from "@/lib/db/queries/run-views";
import { AppError } from "@/lib/http/errors";

const idParam = z.uuid();

/** GET /api/runs/:id — a run's status and key numbers, polled by the upload page while it is analysed. */
export const GET = defineRoute("run.read", z.object({}), async ({ params }) => {
  const id = idParam.safeParse(params.id);
  const run = id.success ? await getRunHeader(id.data) : null;
  if (!run) throw new AppError("not-found", "No run has this id.");
  return {
    id: run.id,
    status: run.status,
    cellSerial: run.serial,
    fileName: run.fileName,
    latestVersion: run.latestVersion,
    error: run.error ? { message: run.error.message, code: run.error.code, line: run.error.line ?? null, column: run.error.column ?? null } : null,
    keyNumbers:
      run.latestVersion === null
        ? null
        : {
            chargedMah: run.chargedMah,
            dischargedMah: run.dischargedMah,
            coulombicEfficiency: run.coulombicEfficiency,
            switchVoltageV: run.switchVoltageV,
            findings: run.findingsCount ?? 0,
            safetyFindings: run.safetyFindingsCount ?? 0,
          },
  };
});
