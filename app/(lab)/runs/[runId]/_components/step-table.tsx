"use client";

import { useId, useMemo, useState } from "react";
import { Pager } from "@/components/data-table";
import { inputClass } from "@/components/ui/field";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { stepKindWords } from "@/lib/charts/step-bands";
import type { StepView } from "@/lib/notebook/report-view";
import { formatAmps, formatClock, formatMah, formatVolts, formatWh, missing } from "@/lib/notebook/format";

const pageSize = 50;

/** Every step of the run, a page of 50 at a time, narrowed to one cycle when the log has several. */
export function StepTable({ steps }: { steps: StepView[] }) {
  const [cycle, setCycle] = useState("");
  const [page, setPage] = useState(1);
  const filterId = useId();
  const cycles = useMemo(() => [...new Set(steps.map((s) => s.cycle).filter((c): c is number => c !== null))].sort((a, b) => a - b), [steps]);
  const selected = cycle === "" ? steps : steps.filter((s) => String(s.cycle) === cycle);
  const rows = selected.slice((page - 1) * pageSize, page * pageSize);
  return (
    <div>
      {cycles.length > 1 ? (
        <div className="no-print mb-3 flex items-center gap-2 text-sm">
          <label htmlFor={filterId} className="font-medium">
            Show
          </label>
          <select
            id={filterId}
            value={cycle}
            onChange={(e) => {
              setCycle(e.target.value);
              setPage(1);
            }}
            className={`${inputClass} w-auto!`}
          >
            <option value="">every cycle ({steps.length} steps)</option>
            {cycles.map((c) => (
              <option key={c} value={String(c)}>
                cycle {c}
              </option>
            ))}
          </select>
        </div>
      ) : null}
      <SimpleTable
        caption="Steps of this run"
        boxed
        headers={headersOf(
          "Step#",
          "Cycle#",
          "Kind",
          "Start (h:mm:ss)#",
          "Duration (h:mm:ss)#",
          "Charged (mAh)#",
          "Discharged (mAh)#",
          "Energy in / out (Wh)#",
          "Start V#",
          "End V#",
          "Mean V#",
          "Mean current (A)#",
          "Lines#",
        )}
      >
        {rows.map((s) => (
          <tr key={s.step} className="whitespace-nowrap">
            <td className={cellClass(true)}>{s.step}</td>
            <td className={cellClass(true)}>{s.cycle ?? missing}</td>
            <td className={`${cellClass()} whitespace-nowrap`}>{stepKindWords[s.kind]}</td>
            <td className={cellClass(true)}>{formatClock(s.start_s)}</td>
            <td className={cellClass(true)}>{formatClock(s.duration_s)}</td>
            <td className={cellClass(true)}>{formatMah(s.charged_mAh)}</td>
            <td className={cellClass(true)}>{formatMah(s.discharged_mAh)}</td>
            <td className={`${cellClass(true)} whitespace-nowrap`}>
              {formatWh(s.charged_Wh)} / {formatWh(s.discharged_Wh)}
            </td>
            <td className={cellClass(true)}>{formatVolts(s.start_voltage_V)}</td>
            <td className={cellClass(true)}>{formatVolts(s.end_voltage_V)}</td>
            <td className={cellClass(true)}>{formatVolts(s.mean_voltage_V)}</td>
            <td className={cellClass(true)}>{formatAmps(s.mean_current_A)}</td>
            <td className={`${cellClass(true)} whitespace-nowrap`}>
              {s.first_line ?? missing}–{s.last_line ?? missing}
            </td>
          </tr>
        ))}
      </SimpleTable>
      {selected.length > pageSize ? <Pager page={page} pageSize={pageSize} total={selected.length} onPage={setPage} /> : null}
    </div>
  );
}
