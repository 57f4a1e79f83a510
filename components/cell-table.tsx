"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import type { ReactNode } from "react";
import { DataTable, Pager, type Column } from "@/components/data-table";
import { DownloadCsvLink } from "@/components/download-csv-link";
import { Badge, cellStatusTone } from "@/components/ui/badge";
import { inputClass } from "@/components/ui/field";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys, toSearch } from "@/lib/api/query-keys";
import { useListParams } from "@/lib/api/use-list-params";
import { batchHref, cellHref } from "@/lib/registry/links";
import type { CellListItem, Page } from "@/lib/db/queries/registry";
import { cellStatuses } from "@/lib/validations/registry";

const defaults = { q: "", status: "", batchId: "", sort: "serial", dir: "asc", page: "1" };
const pageSize = 25;

const serialColumn: Column<CellListItem> = {
  key: "serial",
  header: "Serial",
  sortKey: "serial",
  cell: (c) => (
    <Link href={cellHref(c.serial)} className="font-mono font-medium text-copper-dark underline-offset-2 hover:underline">
      {c.serial}
    </Link>
  ),
};
const statusColumn: Column<CellListItem> = {
  key: "status",
  header: "Status",
  sortKey: "status",
  cell: (c) => <Badge tone={cellStatusTone[c.status]}>{c.status}</Badge>,
};
const batchColumn: Column<CellListItem> = {
  key: "batch",
  header: "Batch",
  sortKey: "lotCode",
  cell: (c) =>
    c.batchId && c.lotCode ? (
      <Link href={batchHref(c.batchId)} className="underline-offset-2 hover:underline">
        {c.lotCode}
      </Link>
    ) : (
      <span className="text-ink-soft">none</span>
    ),
};
const typeColumn: Column<CellListItem> = { key: "type", header: "Cell type", sortKey: "cellType", cell: (c) => c.cellTypeName };
const registeredColumn: Column<CellListItem> = {
  key: "registered",
  header: "Registered",
  sortKey: "createdAt",
  // JSON carries the timestamp as text; the day is what a person looks for here.
  cell: (c) => new Date(c.createdAt).toLocaleDateString("en-CA"),
};

export interface CellTableProps {
  /** Fixes the table to one batch (the batch page); otherwise a batch filter is offered. */
  batchId?: string;
  batches?: { id: string; lotCode: string }[];
  caption: string;
  empty: ReactNode;
}

/** Cells from /api/cells with search, status filter, sort and pages kept in the URL. */
export function CellTable({ batchId, batches = [], caption, empty }: CellTableProps) {
  const { get, set } = useListParams(defaults);
  const params = {
    q: get("q") || undefined,
    status: get("status") || undefined,
    batchId: batchId ?? (get("batchId") || undefined),
    sort: get("sort"),
    dir: get("dir"),
    page: Number(get("page")) || 1,
    pageSize,
  };
  const query = useQuery({
    queryKey: queryKeys.cells.list(params),
    queryFn: () => fetchJson<Page<CellListItem>>(`/api/cells${toSearch(params)}`),
    placeholderData: keepPreviousData,
  });
  const filtered = Boolean(params.q || params.status || (!batchId && params.batchId));
  const columns = batchId
    ? [serialColumn, statusColumn, registeredColumn]
    : [serialColumn, statusColumn, batchColumn, typeColumn, registeredColumn];

  return (
    <div>
      <div className="mb-3 flex flex-wrap gap-2" role="search" aria-label={`Filter ${caption.toLowerCase()}`}>
        <label className="sr-only" htmlFor="cell-q">
          Search cells
        </label>
        <input
          id="cell-q"
          type="search"
          placeholder={batchId ? "Search serial" : "Search serial, lot or cell type"}
          defaultValue={params.q}
          onChange={(e) => set({ q: e.target.value })}
          className={`${inputClass} w-72!`}
        />
        <label className="sr-only" htmlFor="cell-status">
          Filter by status
        </label>
        <select id="cell-status" value={params.status ?? ""} onChange={(e) => set({ status: e.target.value })} className={`${inputClass} w-auto!`}>
          <option value="">Any status</option>
          {cellStatuses.map((s) => (
            <option key={s} value={s}>
              {s}
            </option>
          ))}
        </select>
        {batchId ? null : (
          <>
            <label className="sr-only" htmlFor="cell-batch">
              Filter by batch
            </label>
            <select id="cell-batch" value={params.batchId ?? ""} onChange={(e) => set({ batchId: e.target.value })} className={`${inputClass} w-auto!`}>
              <option value="">Any batch</option>
              {batches.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.lotCode}
                </option>
              ))}
            </select>
          </>
        )}
        <DownloadCsvLink
          href="/api/cells/export"
          filters={{ q: params.q, status: params.status, batchId: params.batchId, sort: params.sort, dir: params.dir }}
          label={batchId ? "Download CSV of these cells" : "Download CSV"}
        />
      </div>
      <DataTable
        caption={caption}
        columns={columns}
        rows={query.data?.items}
        rowKey={(c) => c.id}
        sort={params.sort}
        dir={params.dir === "desc" ? "desc" : "asc"}
        onSort={(sort, dir) => set({ sort, dir })}
        isLoading={query.isPending}
        error={query.error}
        onRetry={() => void query.refetch()}
        pageSize={pageSize}
        empty={filtered ? "No cell matches these filters." : empty}
      />
      {query.data ? <Pager page={params.page} pageSize={pageSize} total={query.data.total} onPage={(p) => set({ page: String(p) })} /> : null}
    </div>
  );
}
