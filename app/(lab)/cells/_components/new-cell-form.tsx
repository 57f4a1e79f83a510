"use client";

import { useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { SelectField, TextField } from "@/components/ui/field";
import { FormMessage } from "@/components/ui/form-message";
import { Panel } from "@/components/ui/panel";
import { queryKeys } from "@/lib/api/query-keys";
import type { ActionResult } from "@/lib/auth/action-result";
import { cellHref } from "@/lib/registry/links";
import { createCellAction } from "../actions";

interface Props {
  batches: { id: string; lotCode: string; cellTypeId: string }[];
  cellTypes: { id: string; name: string }[];
}

export function NewCellForm({ batches, cellTypes }: Props) {
  const queryClient = useQueryClient();
  // Controlled, so a refused entry stays on screen for correction.
  const [serial, setSerial] = useState("");
  const [batchId, setBatchId] = useState("");
  const [cellTypeId, setCellTypeId] = useState("");
  const [state, submit, pending] = useActionState<ActionResult<{ id: string; serial: string }> | null, FormData>(async (_prev, form) => {
    const result = await createCellAction(form);
    if (result.ok) {
      setSerial("");
      void queryClient.invalidateQueries({ queryKey: queryKeys.cells.all });
    }
    return result;
  }, null);
  const errors = state && !state.ok ? (state.fieldErrors ?? {}) : {};
  const batchType = batches.find((b) => b.id === batchId)?.cellTypeId;

  if (cellTypes.length === 0) {
    return (
      <Panel title="Register a cell">
        <p className="text-sm text-ink-soft">
          Add a cell type first: every cell is of one cell type. An engineer adds them on{" "}
          <Link href="/cell-types" className="text-copper-dark underline">
            Cell types
          </Link>
          .
        </p>
      </Panel>
    );
  }

  return (
    <section id="register-cell" aria-labelledby="register-cell-title">
      <Panel title={<span id="register-cell-title">Register a cell</span>}>
        <form action={submit} className="space-y-3" noValidate>
          <TextField
            label="Serial"
            name="serial"
            required
            autoComplete="off"
            spellCheck={false}
            value={serial}
            onChange={(e) => setSerial(e.target.value)}
            errors={errors.serial}
            hint="As printed on the cell: letters, digits and . _ - / # +"
          />
          <SelectField
            label="Batch"
            name="batchId"
            value={batchId}
            onChange={(e) => setBatchId(e.target.value)}
            errors={errors.batchId}
            hint="Leave empty for a cell that came without a lot."
          >
            <option value="">No batch</option>
            {batches.map((b) => (
              <option key={b.id} value={b.id}>
                {b.lotCode}
              </option>
            ))}
          </SelectField>
          <SelectField
            label="Cell type"
            name="cellTypeId"
            value={batchId ? (batchType ?? "") : cellTypeId}
            onChange={(e) => setCellTypeId(e.target.value)}
            disabled={Boolean(batchId)}
            errors={errors.cellTypeId}
            hint={batchId ? "A cell in a batch takes the batch's cell type." : "Needed when the cell has no batch."}
          >
            <option value="">Choose…</option>
            {cellTypes.map((t) => (
              <option key={t.id} value={t.id}>
                {t.name}
              </option>
            ))}
          </SelectField>
          <FormMessage
            state={state}
            success={(cell) => (
              <>
                Registered{" "}
                <Link href={cellHref(cell.serial)} className="font-mono underline">
                  {cell.serial}
                </Link>
                .
              </>
            )}
          />
          <Button type="submit" tone="primary" disabled={pending}>
            {pending ? "Saving…" : "Register cell"}
          </Button>
        </form>
      </Panel>
    </section>
  );
}
