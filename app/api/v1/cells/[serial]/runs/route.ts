import { z } from "zod";
import { defineRoute } from "@/lib/auth/route";
import { listRunsOfCell } from "@/lib/db/queries/run-views";
import { AppError } from "@/lib/http/errors";
import { runJson } from "@/lib/ingest/api-json";

/** GET /api/v1/cells/:serial/runs — every run of a cell, newest first, with key numbers. */
export const GET = defineRoute(
  "run.read",
  z.object({}),
  async ({ params }) => {
    const serial = typeof params.serial === "string" ? params.serial : "";
    const cell = await listRunsOfCell(serial);
    if (!cell) throw new AppError("not-found", `No cell has the serial ${serial}.`);
    return { cell_serial: cell.serial, runs: cell.runs.map(runJson) };
  },
  { auth: "session-or-token" },
);
