"use client";

import type { ReactNode } from "react";

export interface Column<T> {
  key: string;
  header: string;
  /** Server-side sort key; columns without one do not sort. */
  sortKey?: string;
  align?: "left" | "right";
  cell: (row: T) => ReactNode;
}

export interface DataTableProps<T> {
  caption: string;
  columns: Column<T>[];
  rows: T[] | undefined;
  rowKey: (row: T) => string;
  sort: string;
  dir: "asc" | "desc";
  onSort: (sortKey: string, dir: "asc" | "desc") => void;
  isLoading: boolean;
  error: Error | null;
  onRetry: () => void;
  empty: ReactNode;
  pageSize: number;
}

/** A table whose sorting, filtering and paging happen on the server; it renders states honestly. */
export function DataTable<T>({ caption, columns, rows, rowKey, sort, dir, onSort, isLoading, error, onRetry, empty, pageSize }: DataTableProps<T>) {
  return (
    <div className="overflow-x-auto rounded-lg border border-rule bg-sheet">
      <table className="min-w-full text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead className="bg-paper text-left text-xs uppercase tracking-wide text-ink-soft">
          <tr>
            {columns.map((col) => {
              const active = col.sortKey && col.sortKey === sort;
              const next = active && dir === "asc" ? "desc" : "asc";
              return (
                <th
                  key={col.key}
                  scope="col"
                  aria-sort={active ? (dir === "asc" ? "ascending" : "descending") : undefined}
                  className={`border-b border-rule px-3 py-2 font-semibold ${col.align === "right" ? "text-right" : ""}`}
                >
                  {col.sortKey ? (
                    <button type="button" onClick={() => onSort(col.sortKey as string, next)} className="inline-flex items-center gap-1 uppercase hover:text-ink">
                      {col.header}
                      <span aria-hidden="true" className="text-[10px]">
                        {active ? (dir === "asc" ? "▲" : "▼") : "↕"}
                      </span>
                    </button>
                  ) : (
                    col.header
                  )}
                </th>
              );
            })}
          </tr>
        </thead>
        <tbody>
          {error ? (
            <tr>
              <td colSpan={columns.length} className="px-3 py-6 text-center">
                <p role="alert" className="mb-2 text-danger">
                  Could not load: {error.message}
                </p>
                <button type="button" onClick={onRetry} className="rounded border border-rule-strong px-3 py-1 text-sm hover:bg-paper">
                  Try again
                </button>
              </td>
            </tr>
          ) : isLoading && !rows ? (
            Array.from({ length: Math.min(pageSize, 6) }, (_, i) => (
              <tr key={i} aria-hidden="true">
                {columns.map((col) => (
                  <td key={col.key} className="border-b border-rule/60 px-3 py-2.5">
                    <span className="block h-3 w-3/4 animate-pulse rounded bg-rule" />
                  </td>
                ))}
              </tr>
            ))
          ) : rows && rows.length === 0 ? (
            <tr>
              <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-soft">
                {empty}
              </td>
            </tr>
          ) : (
            rows?.map((row) => (
              <tr key={rowKey(row)} className="border-b border-rule/60 last:border-0 hover:bg-copper-wash/40">
                {columns.map((col) => (
                  <td key={col.key} className={`px-3 py-2 ${col.align === "right" ? "text-right tabular-nums" : ""}`}>
                    {col.cell(row)}
                  </td>
                ))}
              </tr>
            ))
          )}
        </tbody>
      </table>
    </div>
  );
}

export function Pager({ page, pageSize, total, onPage }: { page: number; pageSize: number; total: number; onPage: (page: number) => void }) {
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const from = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const to = Math.min(total, page * pageSize);
  return (
    <nav aria-label="Pages" className="mt-3 flex items-center justify-between text-sm text-ink-soft">
      <span>
        {from}–{to} of {total}
      </span>
      <span className="flex items-center gap-2">
        <button type="button" disabled={page <= 1} onClick={() => onPage(page - 1)} className="rounded border border-rule-strong px-2.5 py-1 disabled:opacity-40">
          Previous
        </button>
        <span>
          Page {page} of {pages}
        </span>
        <button type="button" disabled={page >= pages} onClick={() => onPage(page + 1)} className="rounded border border-rule-strong px-2.5 py-1 disabled:opacity-40">
          Next
        </button>
      </span>
    </nav>
  );
}
