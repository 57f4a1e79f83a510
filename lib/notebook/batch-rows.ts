/**
 * The batch page's cell table: one row per cell with its figures, searched, filtered, sorted and
 * paged on the server. A batch holds tens to a few thousand cells, so the rows are composed once
 * per request and ordered here rather than in SQL (the figures come out of JSON and cycle rows).
 * Missing figures sort last in either direction, so "lowest capacity first" starts with a number.
 */
import type { BatchCellSort, BatchCellsQuery } from "@/lib/validations/notebook";
import type { CellFigures } from "./cell-figures";

export interface BatchCellRow {
  cellId: string;
  serial: string;
  status: "active" | "flagged" | "retired";
  runs: number;
  lastTestedAt: string | null;
  deliveredMah: number | null;
  deliveredRunId: string | null;
  sohPercent: number | null;
  dcirMohm: number | null;
  dcirMethod: string | null;
  coulombicEfficiency: number | null;
  findings: number | null;
  safetyFindings: number | null;
  /** Unclosed flags, when the lab keeps flags. */
  openFlags: number | null;
}

export function batchCellRow(cell: { id: string; serial: string; status: BatchCellRow["status"] }, f: CellFigures, openFlags: number | null): BatchCellRow {
  return {
    cellId: cell.id,
    serial: cell.serial,
    status: cell.status,
    runs: f.runs,
    lastTestedAt: f.lastTestedAt,
    deliveredMah: f.delivered?.mAh ?? null,
    deliveredRunId: f.delivered?.runId ?? null,
    sohPercent: f.sohPercent,
    dcirMohm: f.dcir?.medianMohm ?? null,
    dcirMethod: f.dcir?.method ?? null,
    coulombicEfficiency: f.coulombicEfficiency,
    findings: f.findings,
    safetyFindings: f.safetyFindings,
    openFlags,
  };
}

const sortValue: Record<BatchCellSort, (r: BatchCellRow) => number | string | null> = {
  serial: (r) => r.serial.toLowerCase(),
  status: (r) => r.status,
  capacity: (r) => r.deliveredMah,
  soh: (r) => r.sohPercent,
  dcir: (r) => r.dcirMohm,
  ce: (r) => r.coulombicEfficiency,
  findings: (r) => r.findings,
  tested: (r) => r.lastTestedAt,
};

export function filterCellRows(rows: readonly BatchCellRow[], query: Pick<BatchCellsQuery, "q" | "status" | "tested">): BatchCellRow[] {
  const q = query.q?.trim().toLowerCase();
  return rows.filter(
    (r) =>
      (!q || r.serial.toLowerCase().includes(q)) &&
      (!query.status || r.status === query.status) &&
      (!query.tested || (query.tested === "tested") === (r.deliveredMah !== null)),
  );
}

export function sortCellRows(rows: readonly BatchCellRow[], sort: BatchCellSort, dir: "asc" | "desc"): BatchCellRow[] {
  const value = sortValue[sort];
  const sign = dir === "asc" ? 1 : -1;
  return [...rows].sort((a, b) => {
    const va = value(a);
    const vb = value(b);
    if (va === null || vb === null) {
      if (va !== vb) return va === null ? 1 : -1;
    } else if (va !== vb) return (va < vb ? -1 : 1) * sign;
    return a.serial.localeCompare(b.serial);
  });
}

export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
}

export function pageOfCellRows(rows: readonly BatchCellRow[], query: BatchCellsQuery): Page<BatchCellRow> {
  const selected = sortCellRows(filterCellRows(rows, query), query.sort, query.dir);
  const start = (query.page - 1) * query.pageSize;
  return { items: selected.slice(start, start + query.pageSize), total: selected.length, page: query.page, pageSize: query.pageSize };
}
