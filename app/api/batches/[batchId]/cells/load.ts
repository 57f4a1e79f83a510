import "server-only";
import { z } from "zod";
import { getBatchCellRows } from "@/lib/db/queries/notebook";
import { getBatch } from "@/lib/db/queries/registry";
import { AppError } from "@/lib/http/errors";

/** The batch named by the route's param, with every cell's figures; 404 for anything else. */
export async function batchWithRows(param: unknown) {
  const id = z.uuid().safeParse(param);
  const [batch, cells] = id.success ? await Promise.all([getBatch(id.data), getBatchCellRows(id.data)]) : [null, null];
  if (!batch || !cells) throw new AppError("not-found", "No batch has this id.");
  return { batch, rows: cells.rows };
}
