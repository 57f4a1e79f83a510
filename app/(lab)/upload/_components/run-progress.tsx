"use client";

import { useQuery } from "@tanstack/react-query";
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys } from "@/lib/api/query-keys";

export interface RunStatusView {
  id: string;
  status: "queued" | "analysing" | "complete" | "failed";
  cellSerial: string;
  fileName: string;
  error: { message: string; code?: string; line: number | null; column: number | null } | null;
  keyNumbers: { chargedMah: number | null; dischargedMah: number | null; coulombicEfficiency: number | null; switchVoltageV: number | null; findings: number; safetyFindings: number } | null;
}

function fmt(value: number | null | undefined, digits = 0): string {
  return value === null || value === undefined ? "–" : value.toFixed(digits);
}

/** Follows a run from queued to complete or failed, polling while the worker is busy. */
export function RunProgress({ runId }: { runId: string }) {
  const query = useQuery({
    queryKey: queryKeys.runs.status(runId),
    queryFn: () => fetchJson<RunStatusView>(`/api/runs/${runId}`),
    refetchInterval: (q) => (q.state.data && (q.state.data.status === "complete" || q.state.data.status === "failed") ? false : 1000),
  });
  const run = query.data;
  if (query.error) return <p className="mt-2 text-sm text-danger">Could not follow the analysis: {query.error.message}</p>;
  if (!run) return <p className="mt-2 text-sm text-ink-soft">Uploaded. Waiting for the analysis…</p>;
  return (
    <div className="mt-3 space-y-2 text-sm" data-testid="run-progress" data-status={run.status}>
      <p className="flex items-center gap-2">
        <Badge tone={run.status === "complete" ? "good" : run.status === "failed" ? "bad" : "accent"}>{run.status}</Badge>
        {run.status === "queued" ? "Waiting for a free analysis worker…" : null}
        {run.status === "analysing" ? "Finding steps, the switch to constant voltage and the totals…" : null}
      </p>
      {run.status === "failed" && run.error ? (
        <p role="alert" className="rounded bg-danger-wash px-3 py-2 text-danger">
          {run.fileName}
          {run.error.line ? ` (line ${run.error.line}${run.error.column ? `, column ${run.error.column}` : ""})` : ""}: {run.error.message}
        </p>
      ) : null}
      {run.status === "complete" && run.keyNumbers ? (
        <p>
          Charged {fmt(run.keyNumbers.chargedMah)} mAh · delivered {fmt(run.keyNumbers.dischargedMah)} mAh
          {run.keyNumbers.switchVoltageV !== null ? ` · switch to constant voltage at ${fmt(run.keyNumbers.switchVoltageV, 3)} V` : ""}
          {run.keyNumbers.coulombicEfficiency !== null ? ` · coulombic efficiency ${fmt(run.keyNumbers.coulombicEfficiency * 100, 1)} %` : ""}
          {run.keyNumbers.safetyFindings > 0 ? <strong className="text-danger"> · {run.keyNumbers.safetyFindings} safety findings</strong> : null} ·{" "}
          <Link className="font-medium text-copper-dark underline" href={`/runs/${run.id}`}>
            Open the run
          </Link>{" "}
          ·{" "}
          <Link className="underline" href={`/cells/${encodeURIComponent(run.cellSerial)}`}>
            Cell {run.cellSerial}
          </Link>
        </p>
      ) : null}
    </div>
  );
}
