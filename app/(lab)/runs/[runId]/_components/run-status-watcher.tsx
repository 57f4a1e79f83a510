"use client";

import { useQuery } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useEffect } from "react";
import { fetchJson } from "@/lib/api/query-client";
import { queryKeys } from "@/lib/api/query-keys";

/** While a run waits or is analysed, polls its status and reloads the page once the analysis has finished. */
export function RunStatusWatcher({ runId, status }: { runId: string; status: string }) {
  const router = useRouter();
  const query = useQuery({
    queryKey: queryKeys.runs.status(runId),
    queryFn: () => fetchJson<{ status: string }>(`/api/runs/${runId}`),
    refetchInterval: (q) => (q.state.data && (q.state.data.status === "complete" || q.state.data.status === "failed") ? false : 2000),
  });
  const now = query.data?.status;
  useEffect(() => {
    if (now && now !== status && (now === "complete" || now === "failed")) router.refresh();
  }, [now, status, router]);
  return (
    <p role="status" className="text-sm text-ink-soft">
      {query.error ? `Could not check the analysis: ${query.error.message}` : `The analysis is ${now ?? status}. This page reloads when it has finished.`}
    </p>
  );
}
