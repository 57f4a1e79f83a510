"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { DataTable, Pager, type Column } from "@/components/data-table";
import { DownloadCsvLink } from "@/components/download-csv-link";
import { Badge, dispositionTone } from "@/components/ui/badge";
import { inputClass } from "@/components/ui/field";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys, toSearch } from "@/lib/api/query-keys";
import { useListParams } from "@/lib/api/use-list-params";
import type { BatchListItem, Page } from "@/lib/db/queries/registry";

const defaults = { q: "", disposition: "", cellTypeId: "", sort: "receivedOn", dir: "desc", page: "1" };
const pageSize = 20;

const columns: Column<BatchListItem>[] = [
  {
    key: "lot",
    header: "Lot code",
    sortKey: "lotCode",
    cell: (b) => (
      <Link href={`/batches/${b.id}`} className="font-medium text-copper-dark underline-offset-2 hover:underline">
        {b.lotCode}
      </Link>
    ),
  },
  { key: "type", header: "Cell type", sortKey: "cellType", cell: (b) => b.cellTypeName },
  { key: "supplier", header: "Supplier", sortKey: "supplier", cell: (b) => b.supplier },
  { key: "received", header: "Received", sortKey: "receivedOn", cell: (b) => <span className="whitespace-nowrap">{b.receivedOn}</span> },
  { key: "qty", header: "Cells (registered / ordered)", sortKey: "quantity", align: "right", cell: (b) => `${b.registeredCells} / ${b.quantity}` },
  {
    key: "spec",
    header: "Capacity spec",
    align: "right",
    cell: (b) => (b.capacityUslMah ? `${b.capacityLslMah}–${b.capacityUslMah} mAh` : `≥ ${b.capacityLslMah} mAh`),
  },
  { key: "disposition", header: "Decision", sortKey: "disposition", cell: (b) => <Badge tone={dispositionTone[b.disposition]}>{b.disposition}</Badge> },
];

export function BatchTable({ cellTypes }: { cellTypes: { id: string; name: string }[] }) {
  const { get, set } = useListParams(defaults);
  const params = {
    q: get("q") || undefined,
    disposition: get("disposition") || undefined,
    cellTypeId: get("cellTypeId") || undefined,
    sort: get("sort"),
    dir: get("dir"),
    page: Number(get("page")),
    pageSize,
  };
  const query = useQuery({
    queryKey: queryKeys.batches.list(params),
    queryFn: () => fetchJson<Page<BatchListItem>>(`/api/batches${toSearch(params)}`),
    placeholderData: keepPreviousData,
  });
  const filtered = Boolean(params.q || params.disposition || params.cellTypeId);

  return (
    <div>
      <div className="mb-3 flex flex-wrap gap-2" role="search">
        <label className="sr-only" htmlFor="batch-q">
          Search batches
        </label>
        <input
          id="batch-q"
          type="search"
          placeholder="Search lot, supplier or cell type"
          defaultValue={params.q}
          onChange={(e) => set({ q: e.target.value })}
          className={`${inputClass} w-72!`}
        />
        <label className="sr-only" htmlFor="batch-disposition">
          Decision
        </label>
        <select id="batch-disposition" value={params.disposition ?? ""} onChange={(e) => set({ disposition: e.target.value })} className={`${inputClass} w-auto!`}>
          <option value="">Any decision</option>
          <option value="pending">pending</option>
          <option value="accepted">accepted</option>
          <option value="rejected">rejected</option>
          <option value="on hold">on hold</option>
        </select>
        <label className="sr-only" htmlFor="batch-type">
          Cell type
        </label>
        <select id="batch-type" value={params.cellTypeId ?? ""} onChange={(e) => set({ cellTypeId: e.target.value })} className={`${inputClass} w-auto!`}>
          <option value="">Any cell type</option>
          {cellTypes.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name}
            </option>
          ))}
        </select>
        <DownloadCsvLink
          href="/api/batches/export"
          filters={{ q: params.q, disposition: params.disposition, cellTypeId: params.cellTypeId, sort: params.sort, dir: params.dir }}
        />
      </div>
      <DataTable
        caption="Batches"
        columns={columns}
        rows={query.data?.items}
        rowKey={(b) => b.id}
        sort={params.sort}
        dir={params.dir === "asc" ? "asc" : "desc"}
        onSort={(sort, dir) => set({ sort, dir })}
        isLoading={query.isPending}
        error={query.error}
        onRetry={() => void query.refetch()}
        pageSize={pageSize}
        empty={filtered ? "No batch matches these filters." : "No batches yet. Register the first lot with the form beside this table."}
      />
      {query.data ? <Pager page={params.page} pageSize={pageSize} total={query.data.total} onPage={(p) => set({ page: String(p) })} /> : null}
    </div>
  );
}
