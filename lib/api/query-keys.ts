/** Every TanStack Query key in one place, so invalidation after a mutation cannot miss a list. */
export const queryKeys = {
  batches: {
    all: ["batches"] as const,
    list: (params: Record<string, string | number | undefined>) => ["batches", "list", params] as const,
    cells: (batchId: string, params: Record<string, string | number | undefined>) => ["batches", "cells", batchId, params] as const,
  },
  cells: {
    all: ["cells"] as const,
    list: (params: Record<string, string | number | undefined>) => ["cells", "list", params] as const,
  },
  audit: {
    all: ["audit"] as const,
    list: (params: Record<string, string | number | undefined>) => ["audit", "list", params] as const,
  },
  cellTypes: {
    all: ["cell-types"] as const,
  },
  runs: {
    all: ["runs"] as const,
    status: (runId: string) => ["runs", "status", runId] as const,
    notes: (runId: string) => ["runs", "notes", runId] as const,
    dischargeCurve: (runId: string) => ["runs", "discharge-curve", runId] as const,
  },
};

export function toSearch(params: Record<string, string | number | undefined>): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v !== undefined && v !== "") search.set(k, String(v));
  const text = search.toString();
  return text ? `?${text}` : "";
}
