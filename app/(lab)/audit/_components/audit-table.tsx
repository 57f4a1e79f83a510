"use client";

import { keepPreviousData, useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { DataTable, Pager, type Column } from "@/components/data-table";
import { DownloadCsvLink } from "@/components/download-csv-link";
import { inputClass } from "@/components/ui/field";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys, toSearch } from "@/lib/api/query-keys";
import { useListParams } from "@/lib/api/use-list-params";
import type { AuditEventView, AuditFilterOptions, AuditPage } from "@/lib/db/queries/audit";
import { AuditDiff } from "@/components/audit/audit-diff";

const defaults = { q: "", entity: "", action: "", actor: "", from: "", to: "", page: "1" };
const pageSize = 50;

/** The start of a local calendar day as an instant; `days` moves to a later day (the exclusive end of a range). */
function localDayStart(isoDate: string, days = 0): string | undefined {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(isoDate);
  if (!match) return undefined;
  return new Date(Number(match[1]), Number(match[2]) - 1, Number(match[3]) + days).toISOString();
}

const when = new Intl.DateTimeFormat("en-CA", { dateStyle: "medium", timeStyle: "medium" });

const columns: Column<AuditEventView>[] = [
  {
    key: "at",
    header: "When",
    cell: (e) => (
      <time dateTime={e.at} className="whitespace-nowrap tabular-nums">
        {when.format(new Date(e.at))}
      </time>
    ),
  },
  { key: "who", header: "Who", cell: (e) => e.actorName ?? "system" },
  { key: "action", header: "Action", cell: (e) => e.action },
  {
    key: "entity",
    header: "Record",
    cell: (e) => (
      <div className="min-w-[10rem]">
        <span className="text-ink-soft">{e.entity}</span>{" "}
        {e.entityHref ? (
          <Link href={e.entityHref} className="font-medium text-copper-dark underline-offset-2 hover:underline">
            {e.entityLabel ?? e.entityId}
          </Link>
        ) : (
          <span className="font-medium">{e.entityLabel ?? ""}</span>
        )}
        <div className="break-all font-mono text-[11px] text-ink-soft">{e.entityId}</div>
      </div>
    ),
  },
  { key: "change", header: "Before → after", cell: (e) => <AuditDiff before={e.before} after={e.after} /> },
];

function Select({ id, label, value, onChange, anyLabel, options }: {
  id: string;
  label: string;
  value: string;
  onChange: (value: string) => void;
  anyLabel: string;
  options: { value: string; label: string }[];
}) {
  return (
    <>
      <label className="sr-only" htmlFor={id}>
        {label}
      </label>
      <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className={`${inputClass} w-auto`}>
        <option value="">{anyLabel}</option>
        {options.map((o) => (
          <option key={o.value} value={o.value}>
            {o.label}
          </option>
        ))}
      </select>
    </>
  );
}

/** The audit trail from /api/audit, newest first, with its filters kept in the URL. */
export function AuditTable({ options }: { options: AuditFilterOptions }) {
  const { get, set } = useListParams(defaults);
  const params = {
    q: get("q") || undefined,
    entity: get("entity") || undefined,
    action: get("action") || undefined,
    actor: get("actor") || undefined,
    since: localDayStart(get("from")),
    until: localDayStart(get("to"), 1),
    page: Number(get("page")) || 1,
    pageSize,
  };
  const query = useQuery({
    queryKey: queryKeys.audit.list(params),
    queryFn: () => fetchJson<AuditPage>(`/api/audit${toSearch(params)}`),
    placeholderData: keepPreviousData,
  });
  const filtered = Boolean(params.q || params.entity || params.action || params.actor || params.since || params.until);
  const toOptions = (values: string[]) => values.map((v) => ({ value: v, label: v }));

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-center gap-2" role="search" aria-label="Filter the audit trail">
        <label className="sr-only" htmlFor="audit-q">
          Search record
        </label>
        <input
          id="audit-q"
          type="search"
          placeholder="Record id, serial or lot code"
          defaultValue={params.q}
          onChange={(e) => set({ q: e.target.value })}
          className={`${inputClass} max-w-xs`}
        />
        <Select id="audit-entity" label="Kind of record" value={params.entity ?? ""} onChange={(entity) => set({ entity })} anyLabel="Any kind of record" options={toOptions(options.entities)} />
        <Select id="audit-action" label="Action" value={params.action ?? ""} onChange={(action) => set({ action })} anyLabel="Any action" options={toOptions(options.actions)} />
        <Select
          id="audit-actor"
          label="Who"
          value={params.actor ?? ""}
          onChange={(actor) => set({ actor })}
          anyLabel="Anyone"
          options={options.actors.map((a) => ({ value: a.id, label: a.name }))}
        />
        <label className="flex items-center gap-1 text-sm text-ink-soft">
          From
          <input type="date" value={get("from")} onChange={(e) => set({ from: e.target.value })} className={`${inputClass} w-auto`} />
        </label>
        <label className="flex items-center gap-1 text-sm text-ink-soft">
          to
          <input type="date" value={get("to")} onChange={(e) => set({ to: e.target.value })} className={`${inputClass} w-auto`} />
        </label>
        <DownloadCsvLink
          href="/api/audit/export"
          filters={{ q: params.q, entity: params.entity, action: params.action, actor: params.actor, since: params.since, until: params.until }}
          label="Download these events (CSV)"
        />
      </div>
      <DataTable
        caption="Audit trail, newest first"
        columns={columns}
        rows={query.data?.items}
        rowKey={(e) => String(e.id)}
        sort="at"
        dir="desc"
        onSort={() => undefined}
        isLoading={query.isPending}
        error={query.error}
        onRetry={() => void query.refetch()}
        pageSize={pageSize}
        empty={filtered ? "No event matches these filters." : "The trail is empty: nothing has been recorded yet."}
      />
      {query.data ? <Pager page={params.page} pageSize={pageSize} total={query.data.total} onPage={(p) => set({ page: String(p) })} /> : null}
    </div>
  );
}
