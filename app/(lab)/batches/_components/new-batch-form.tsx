"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useActionState, useEffect, useRef } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextAreaField, TextField } from "@/components/ui/field";
import { Panel } from "@/components/ui/panel";
import { queryKeys } from "@/lib/api/query-keys";
import type { ActionResult } from "@/lib/auth/action-result";
import { createBatchAction } from "../actions";

export function NewBatchForm({ cellTypes }: { cellTypes: { id: string; name: string; ratedCapacityMah: number }[] }) {
  const queryClient = useQueryClient();
  const formRef = useRef<HTMLFormElement>(null);
  const [state, submit, pending] = useActionState<ActionResult<{ id: string }> | null, FormData>((_prev, form) => createBatchAction(form), null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};

  useEffect(() => {
    if (state?.ok) {
      formRef.current?.reset();
      void queryClient.invalidateQueries({ queryKey: queryKeys.batches.all });
    }
  }, [state, queryClient]);

  if (cellTypes.length === 0) {
    return (
      <Panel title="Register a batch">
        <p className="text-sm text-ink-soft">Add a cell type first: every batch is of one cell type.</p>
      </Panel>
    );
  }

  return (
    <Panel title="Register a batch">
      <form ref={formRef} action={submit} className="space-y-3" noValidate>
        <TextField label="Lot code" name="lotCode" required errors={errors.lotCode} autoComplete="off" />
        <SelectField label="Cell type" name="cellTypeId" required errors={errors.cellTypeId} defaultValue="">
          <option value="" disabled>
            Choose…
          </option>
          {cellTypes.map((t) => (
            <option key={t.id} value={t.id}>
              {t.name} ({t.ratedCapacityMah} mAh)
            </option>
          ))}
        </SelectField>
        <TextField label="Supplier" name="supplier" required errors={errors.supplier} />
        <div className="grid grid-cols-2 gap-3">
          <TextField label="Received" name="receivedOn" type="date" required errors={errors.receivedOn} />
          <TextField label="Quantity" name="quantity" inputMode="numeric" required errors={errors.quantity} />
        </div>
        <div className="grid grid-cols-2 gap-3">
          <TextField label="Lower capacity limit (mAh)" name="capacityLslMah" inputMode="decimal" required errors={errors.capacityLslMah} />
          <TextField label="Upper limit (mAh, optional)" name="capacityUslMah" inputMode="decimal" errors={errors.capacityUslMah} />
        </div>
        <TextAreaField label="Notes" name="notes" rows={2} errors={errors.notes} />
        {state && !state.ok ? (
          <p role="alert" className="text-sm text-danger">
            {state.error}
          </p>
        ) : null}
        {state?.ok ? (
          <p role="status" className="text-sm text-ok">
            Batch registered.
          </p>
        ) : null}
        <Button type="submit" tone="primary" disabled={pending}>
          {pending ? "Saving…" : "Register batch"}
        </Button>
      </form>
    </Panel>
  );
}
