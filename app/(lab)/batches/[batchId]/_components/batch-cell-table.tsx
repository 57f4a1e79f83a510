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
import type { BatchCellRow, Page } from "@/lib/notebook/batch-rows";
import { formatMah, formatMilliohm, formatPercent, missing, withUnit } from "@/lib/notebook/format";
import { cellHref } from "@/lib/registry/links";
import { cellStatuses } from "@/lib/validations/registry";

const batchCellDefaults = { q: "", status: "", tested: "", sort: "serial", dir: "asc", page: "1" };
/** Also the page size the server renders the first page with. */
const batchCellPageSize = 25;

const columns: Column<BatchCellRow>[] = [
  {
    key: "serial",
    header: "Serial",
    sortKey: "serial",
    cell: (r) => (
      <Link href={cellHref(r.serial)} className="whitespace-nowrap font-mono font-medium text-copper-dark underline-offset-2 hover:underline">
        {r.serial}
      </Link>
    ),
  },
  { key: "status", header: "Status", sortKey: "status", cell: (r) => <Badge tone={cellStatusTone[r.status]}>{r.status}</Badge> },
  {
    key: "capacity",
    header: "Latest delivered capacity",
    sortKey: "capacity",
    align: "right",
    cell: (r) =>
      r.deliveredMah !== null && r.deliveredRunId ? (
        <Link href={`/runs/${r.deliveredRunId}`} className="underline-offset-2 hover:underline">
          {formatMah(r.deliveredMah)}
        </Link>
      ) : (
        <span className="text-ink-soft">not tested</span>
      ),
  },
  { key: "soh", header: "SOH", sortKey: "soh", align: "right", cell: (r) => withUnit(r.sohPercent, 1, "%") },
  {
    key: "dcir",
    header: "DCIR",
    sortKey: "dcir",
    align: "right",
    cell: (r) => (r.dcirMohm === null ? missing : <span title={r.dcirMethod ?? undefined}>{formatMilliohm(r.dcirMohm)}</span>),
  },
  { key: "ce", header: "CE", sortKey: "ce", align: "right", cell: (r) => formatPercent(r.coulombicEfficiency, 2) },
  {
    key: "flags",
    header: "Flags and findings",
    sortKey: "findings",
    align: "right",
    cell: (r) => (
      <span className="inline-flex flex-wrap justify-end gap-1">
        {r.openFlags ? <Badge tone="warn">{r.openFlags === 1 ? "1 open flag" : `${r.openFlags} open flags`}</Badge> : null}
        {r.safetyFindings ? <Badge tone="bad">{r.safetyFindings} safety</Badge> : null}
        {r.findings !== null ? <span className="whitespace-nowrap text-ink-soft">{r.findings === 1 ? "1 finding" : `${r.findings} findings`}</span> : <span className="text-ink-soft">{missing}</span>}
      </span>
    ),
  },
  { key: "tested", header: "Last tested", sortKey: "tested", cell: (r) => <span className="whitespace-nowrap">{r.lastTestedAt ? r.lastTestedAt.slice(0, 10) : missing}</span> },
];

/**
 * The batch's cells with their figures from /api/batches/:id/cells: search, status and tested
 * filters, sort and page kept in the URL; the first page arrives with the page itself.
 */
export function BatchCellTable({ batchId, lotCode, initial, empty }: { batchId: string; lotCode: string; initial: Page<BatchCellRow>; empty: ReactNode }) {
  const { get, set } = useListParams(batchCellDefaults);
  const params = {
    q: get("q") || undefined,
    status: get("status") || undefined,
    tested: get("tested") || undefined,
    sort: get("sort"),
    dir: get("dir"),
    page: Number(get("page")) || 1,
    pageSize: batchCellPageSize,
  };
  const isDefault = !params.q && !params.status && !params.tested && params.sort === batchCellDefaults.sort && params.dir === batchCellDefaults.dir && params.page === 1;
  const query = useQuery({
    queryKey: queryKeys.batches.cells(batchId, params),
    queryFn: () => fetchJson<Page<BatchCellRow>>(`/api/batches/${batchId}/cells${toSearch(params)}`),
    placeholderData: keepPreviousData,
    initialData: isDefault ? initial : undefined,
  });
  const filtered = Boolean(params.q || params.status || params.tested);

  return (
    <div>
      <div className="mb-3 flex flex-wrap gap-2" role="search" aria-label={`Filter the cells of batch ${lotCode}`}>
        <label className="sr-only" htmlFor="batch-cell-q">
          Search serial
        </label>
        <input id="batch-cell-q" type="search" placeholder="Search serial" defaultValue={params.q} onChange={(e) => set({ q: e.target.value })} className={`${inputClass} w-56!`} />
        <label className="sr-only" htmlFor="batch-cell-status">
          Filter by status
        </label>
        <select id="batch-cell-status" value={params.status ?? ""} onChange={(e) => set({ status: e.target.value })} className={`${inputClass} w-auto!`}>
          <option value="">Any status</option>
          {cellStatuses.map((s) => (
            <option key={s} value={s}>
              {s}
            </option>
          ))}
        </select>
        <label className="sr-only" htmlFor="batch-cell-tested">
          Filter by testing
        </label>
        <select id="batch-cell-tested" value={params.tested ?? ""} onChange={(e) => set({ tested: e.target.value })} className={`${inputClass} w-auto!`}>
          <option value="">Tested or not</option>
          <option value="tested">With a delivered capacity</option>
          <option value="untested">Not tested yet</option>
        </select>
        <DownloadCsvLink
          href={`/api/batches/${batchId}/cells/export`}
          filters={{ q: params.q, status: params.status, tested: params.tested, sort: params.sort, dir: params.dir }}
          label="Download CSV of these cells"
        />
      </div>
      <DataTable
        caption={`Cells of batch ${lotCode} with their figures`}
        columns={columns}
        rows={query.data?.items}
        rowKey={(r) => r.cellId}
        sort={params.sort}
        dir={params.dir === "desc" ? "desc" : "asc"}
        onSort={(sort, dir) => set({ sort, dir })}
        isLoading={query.isPending}
        error={query.error}
        onRetry={() => void query.refetch()}
        pageSize={batchCellPageSize}
        empty={filtered ? "No cell matches these filters." : empty}
      />
      {query.data ? <Pager page={params.page} pageSize={batchCellPageSize} total={query.data.total} onPage={(p) => set({ page: String(p) })} /> : null}
      <p className="mt-2 text-xs text-ink-soft">
        Delivered capacity: the discharge of the newest run&apos;s last full cycle (a charge, then a discharge). SOH = delivered / rated capacity. CE = charge out / charge in of that
        cycle. DCIR: the IEC 61960-3 two-current result where the cell has one, otherwise a current-step estimate (hover for the method).
      </p>
    </div>
  );
}
