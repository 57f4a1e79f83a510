"use client";

import { useQueries, type UseQueryResult } from "@tanstack/react-query";
import { useCallback, useId, useMemo, useState } from "react";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys } from "@/lib/api/query-keys";
import type { DischargeCurvePayload } from "@/lib/db/queries/notebook";
import { DischargeOverlayChart, type LabelledCurve } from "./summary-charts";

export interface OverlayOption {
  runId: string;
  label: string;
}

/** More than this and the lines can no longer be told apart, in colour or in print. */
const maxSelected = 6;

/**
 * Discharge curves of the runs a person ticks, drawn over each other. Each curve is one query
 * (cached per run, so ticking back and forth does not refetch); the first selection arrives
 * prefetched from the server.
 */
export function CurveOverlay({ options, initial, title, prefetched }: { options: OverlayOption[]; initial: string[]; title: string; prefetched: DischargeCurvePayload[] }) {
  const [selected, setSelected] = useState<string[]>(initial);
  const groupId = useId();
  const seed = useMemo(() => new Map(prefetched.map((p) => [p.runId, p])), [prefetched]);
  const labelOf = useMemo(() => new Map(options.map((o) => [o.runId, o.label])), [options]);
  // `combine` keeps its result stable while the queries' data stay the same, so the chart is not rebuilt on every render.
  const combine = useCallback(
    (results: UseQueryResult<DischargeCurvePayload>[]) => ({
      results,
      curves: results.flatMap((r, i): LabelledCurve[] => {
        const runId = selected[i] as string;
        const c = r.data?.curve;
        return c ? [{ key: runId, label: labelOf.get(runId) ?? runId.slice(0, 8), capacity_mAh: c.capacity_mAh, voltage_V: c.voltage_V }] : [];
      }),
    }),
    [selected, labelOf],
  );
  const { results, curves } = useQueries({
    queries: selected.map((runId) => ({
      queryKey: queryKeys.runs.dischargeCurve(runId),
      queryFn: () => fetchJson<DischargeCurvePayload>(`/api/runs/${runId}/discharge-curve`),
      initialData: seed.get(runId),
      staleTime: 5 * 60_000,
    })),
    combine,
  });
  const loading = results.some((r) => r.isPending);
  const failed = results.filter((r) => r.error);
  const without = results.filter((r) => r.data && !r.data.curve).length;

  const toggle = (runId: string) =>
    setSelected((now) => (now.includes(runId) ? now.filter((id) => id !== runId) : now.length >= maxSelected ? now : [...now, runId]));

  if (options.length === 0) return <p className="text-sm text-ink-soft">No discharge curves yet: they appear once a run with a full discharge has been analysed.</p>;

  return (
    <div className="grid gap-6 lg:grid-cols-[16rem_1fr]">
      <fieldset className="no-print" aria-describedby={`${groupId}-hint`}>
        <legend className="text-sm font-semibold">Curves to draw</legend>
        <p id={`${groupId}-hint`} className="mb-2 text-xs text-ink-soft">
          Up to {maxSelected} at once.
        </p>
        <ul className="max-h-80 space-y-1 overflow-y-auto pr-1 text-sm">
          {options.map((o) => {
            const on = selected.includes(o.runId);
            return (
              <li key={o.runId}>
                <label className="flex items-center gap-2">
                  <input type="checkbox" checked={on} disabled={!on && selected.length >= maxSelected} onChange={() => toggle(o.runId)} className="h-4 w-4 accent-copper" />
                  {o.label}
                </label>
              </li>
            );
          })}
        </ul>
      </fieldset>
      <div>
        {failed.length ? (
          <p role="alert" className="mb-2 text-sm text-danger">
            {failed.length === 1 ? "One curve" : `${failed.length} curves`} could not be loaded: {failed[0]?.error?.message}{" "}
            <button type="button" onClick={() => failed.forEach((r) => void r.refetch())} className="underline">
              Try again
            </button>
          </p>
        ) : null}
        {curves.length ? (
          <DischargeOverlayChart curves={curves} title={title} />
        ) : loading ? (
          <div aria-busy="true" aria-label="Loading curves" className="h-72 animate-pulse rounded bg-rule/50" />
        ) : (
          <p className="text-sm text-ink-soft">Tick a run to draw its discharge curve.</p>
        )}
        {without ? <p className="mt-2 text-xs text-ink-soft">{without === 1 ? "One selected run has" : `${without} selected runs have`} no discharge curve.</p> : null}
      </div>
    </div>
  );
}
