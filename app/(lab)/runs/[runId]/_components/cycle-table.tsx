"use client";

import { useState } from "react";
import { Pager } from "@/components/data-table";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { CycleView } from "@/lib/notebook/report-view";
import { formatClock, formatCRate, formatMah, formatPercent, formatVolts, missing } from "@/lib/notebook/format";

const cvEnd: Record<string, string> = {
  "termination-current": "at termination current",
  "cut-short": "cut short",
  unknown: "termination unknown",
};

/** The switch point in the trade's terms: when, at what voltage, after how much charge. */
function switchPoint(c: CycleView): string {
  const t = c.charge?.transition;
  if (!t) return missing;
  return `${formatClock(t.time_s)} · ${formatVolts(t.voltage_V)} · ${formatMah(t.capacity_mAh)}`;
}

/** The final CV current as C/x: the engine's label when it knew the rated capacity, else reckoned from the cell type's. */
function finalCurrent(c: CycleView, ratedMah: number): string {
  const cv = c.charge?.cv;
  if (!cv) return missing;
  return cv.final_current_label ?? formatCRate(cv.final_current_A, ratedMah);
}

const pageSize = 50;

/** Every cycle of the run, 50 to a page (a cycle-life log has hundreds). */
export function CycleTable({ cycles, ratedMah }: { cycles: CycleView[]; ratedMah: number }) {
  const [page, setPage] = useState(1);
  const rows = cycles.slice((page - 1) * pageSize, page * pageSize);
  return (
    <>
      <SimpleTable
        caption="Cycles of this run"
        boxed
        headers={headersOf(
          "Cycle#",
          "Charged (mAh)#",
          "Delivered (mAh)#",
          "Coulombic efficiency#",
          "Charge time (h:mm:ss)#",
          "CC→CV switch (time · V · mAh)",
          "CC share#",
          "CV time (h:mm:ss)#",
          "Final CV current",
          "CV ended",
          "Discharge time (h:mm:ss)#",
          "Mean discharge V#",
        )}
      >
        {rows.map((c) => (
          <tr key={c.cycle} className="whitespace-nowrap">
            <td className={cellClass(true)}>{c.cycle}</td>
            <td className={cellClass(true)}>{c.charge ? formatMah(c.charge.mAh) : missing}</td>
            <td className={cellClass(true)}>{c.discharge ? formatMah(c.discharge.mAh) : missing}</td>
            <td className={cellClass(true)}>{formatPercent(c.coulombic_efficiency, 2)}</td>
            <td className={cellClass(true)}>{formatClock(c.charge?.duration_s)}</td>
            <td className={`${cellClass()} whitespace-nowrap`}>{switchPoint(c)}</td>
            <td className={cellClass(true)}>{formatPercent(c.charge?.cc_share, 1)}</td>
            <td className={cellClass(true)}>{formatClock(c.charge?.cv?.duration_s)}</td>
            <td className={cellClass()}>{finalCurrent(c, ratedMah)}</td>
            <td className={cellClass()}>{c.charge?.cv?.ended_by ? (cvEnd[c.charge.cv.ended_by] ?? c.charge.cv.ended_by) : missing}</td>
            <td className={cellClass(true)}>{formatClock(c.discharge?.duration_s)}</td>
            <td className={cellClass(true)}>{formatVolts(c.discharge?.mean_voltage_V)}</td>
          </tr>
        ))}
      </SimpleTable>
      {cycles.length > pageSize ? <Pager page={page} pageSize={pageSize} total={cycles.length} onPage={setPage} /> : null}
    </>
  );
}
