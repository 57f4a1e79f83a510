"use client";

import { useRouter } from "next/navigation";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { SelectField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import type { ActionResult } from "@/lib/auth/action-result";
import { reanalyseRunAction } from "../actions";

/**
 * Analyses the stored file again, with the columns as detected or with a saved column map. The
 * file is not touched; the new analysis becomes the next version and the earlier ones stay.
 */
export function ReanalyseForm({ runId, maps }: { runId: string; maps: { id: string; name: string; ownerName: string }[] }) {
  const router = useRouter();
  const [state, submit, pending] = useActionState<ActionResult<{ runId: string }> | null, FormData>(async (_prev, form) => {
    const result = await reanalyseRunAction(form);
    // The page then shows the analysis in progress and reloads itself when it has finished.
    if (result.ok) router.refresh();
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  return (
    <form action={submit} className="flex flex-wrap items-end gap-3" aria-label="Analyse this run again">
      <input type="hidden" name="runId" value={runId} />
      <SelectField label="Columns" name="columnMapId" defaultValue="" errors={errors.columnMapId} className="w-auto">
        <option value="">As detected from the file</option>
        {maps.map((m) => (
          <option key={m.id} value={m.id}>
            Saved map: {m.name} ({m.ownerName})
          </option>
        ))}
      </SelectField>
      <Button type="submit" disabled={pending}>
        {pending ? "Starting…" : "Analyse again"}
      </Button>
      <div className="basis-full">
        <FormMessage state={state} success={() => "Analysis started: the page follows it and shows the new version when it has finished."} />
      </div>
    </form>
  );
}
