import "server-only";
import { AppError } from "@/lib/http/errors";
import { listBatches, listCells, type BatchListItem, type CellListItem, type Page } from "@/lib/db/queries/registry";
import type { BatchListQuery, CellListQuery } from "@/lib/validations/registry";
import { csvResponse, toCsv, type CsvColumn } from "./csv";

/** An export is one sheet a person opens; beyond this the filters should narrow it. */
export const maxExportRows = 50_000;
const chunk = 1_000;

type Filters<Q> = Omit<Q, "page" | "pageSize">;

/** Every row the table's filters select, in the table's order, read a page at a time. */
async function allRows<Q, T>(list: (query: Q) => Promise<Page<T>>, filters: Filters<Q>): Promise<T[]> {
  const rows: T[] = [];
  for (let page = 1; ; page += 1) {
    const result = await list({ ...filters, page, pageSize: chunk } as Q);
    if (result.total > maxExportRows)
      throw new AppError("payload-too-large", `These filters select ${result.total} rows; an export holds at most ${maxExportRows}. Narrow the filters.`);
    rows.push(...result.items);
    if (result.items.length < chunk) return rows;
  }
}

const today = () => new Date().toISOString().slice(0, 10);

const cellColumns: CsvColumn<CellListItem>[] = [
  { header: "Serial", value: (c) => c.serial },
  { header: "Status", value: (c) => c.status },
  { header: "Batch lot code", value: (c) => c.lotCode },
  { header: "Cell type", value: (c) => c.cellTypeName },
  { header: "Registered at (UTC, ISO 8601)", value: (c) => new Date(c.createdAt) },
];

const batchColumns: CsvColumn<BatchListItem>[] = [
  { header: "Lot code", value: (b) => b.lotCode },
  { header: "Cell type", value: (b) => b.cellTypeName },
  { header: "Supplier", value: (b) => b.supplier },
  { header: "Received on (date)", value: (b) => b.receivedOn },
  { header: "Cells ordered (count)", value: (b) => b.quantity },
  { header: "Cells registered (count)", value: (b) => b.registeredCells },
  { header: "Lower capacity limit (mAh)", value: (b) => b.capacityLslMah },
  { header: "Upper capacity limit (mAh)", value: (b) => b.capacityUslMah },
  { header: "Decision", value: (b) => b.disposition },
];

export async function cellsCsv(filters: Filters<CellListQuery>): Promise<Response> {
  const rows = await allRows(listCells, filters);
  return csvResponse(toCsv(cellColumns, rows), `kneepoint-cells-${today()}.csv`);
}

export async function batchesCsv(filters: Filters<BatchListQuery>): Promise<Response> {
  const rows = await allRows(listBatches, filters);
  return csvResponse(toCsv(batchColumns, rows), `kneepoint-batches-${today()}.csv`);
}
