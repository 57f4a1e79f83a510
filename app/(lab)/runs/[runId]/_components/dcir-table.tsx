import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { DcirView } from "@/lib/notebook/report-view";
import { formatAmps, formatClock, formatMilliohm, formatNumber, formatVolts, missing } from "@/lib/notebook/format";

const shown = 50;

const methodWords: Record<string, string> = {
  "IEC 61960-3 DC": "IEC 61960-3 two-current method",
  "step-edge": "current step (estimate)",
};

/** DC resistance results with the method, currents, voltages and when each voltage was read. */
export function DcirTable({ results, edgesTotal }: { results: DcirView[]; edgesTotal: number | null }) {
  const rows = results.slice(0, shown);
  return (
    <div className="space-y-2">
      <SimpleTable
        caption="DC resistance results"
        boxed
        headers={headersOf("Method", "R (mΩ)#", "I1 (A)#", "I2 (A)#", "U1 (V)#", "U2 (V)#", "U1 read at#", "U2 read at#", "Line#", "Delay after the step (s)#")}
      >
        {rows.map((r, i) => (
          <tr key={`${r.method}-${r.time_s}-${i}`}>
            <td className={cellClass()}>{methodWords[r.method] ?? r.method}</td>
            <td className={`${cellClass(true)} font-semibold`}>{formatMilliohm(r.resistance_mOhm)}</td>
            <td className={cellClass(true)}>{formatAmps(r.i1_A)}</td>
            <td className={cellClass(true)}>{formatAmps(r.i2_A)}</td>
            <td className={cellClass(true)}>{formatVolts(r.u1_V)}</td>
            <td className={cellClass(true)}>{formatVolts(r.u2_V)}</td>
            <td className={cellClass(true)}>{formatClock(r.u1_time_s, { tenths: true })}</td>
            <td className={cellClass(true)}>{formatClock(r.u2_time_s, { tenths: true })}</td>
            <td className={cellClass(true)}>{r.line ?? missing}</td>
            <td className={cellClass(true)}>{r.delay_s === null ? missing : formatNumber(r.delay_s, 1)}</td>
          </tr>
        ))}
      </SimpleTable>
      <p className="text-xs text-ink-soft">
        IEC 61960-3 method: R = (U1 − U2) / (I2 − I1), U1 at the end of 10 s at 0.2 It and U2 at the end of 1 s at 1 It. Current-step estimates take the voltage just
        before and just after a sharp change of current, so they include what polarisation builds within the logging interval.
        {results.length > shown ? ` The first ${shown} of ${results.length} results are shown.` : ""}
        {edgesTotal !== null && edgesTotal > results.filter((r) => r.method === "step-edge").length ? ` The log has ${edgesTotal} current steps in all.` : ""}
      </p>
    </div>
  );
}
