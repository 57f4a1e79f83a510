import Link from "next/link";
import { Sparkline } from "@/components/charts/sparkline";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { CellRunEntry } from "@/lib/db/queries/notebook";
import { dcirOf } from "@/lib/notebook/cell-figures";
import { formatDateTime, formatMah, formatMilliohm, formatPercent, formatVolts, missing } from "@/lib/notebook/format";

const statusTone: Record<string, BadgeTone> = { queued: "neutral", analysing: "accent", complete: "good", failed: "bad" };

/** Every run of the cell, newest first: a voltage sparkline and the numbers a person compares runs by. */
export function CellRuns({ runs, serial }: { runs: CellRunEntry[]; serial: string }) {
  return (
    <SimpleTable
      caption={`Runs of cell ${serial}`}
      headers={headersOf("Run", "Voltage", "Charged (mAh)#", "Delivered (mAh)#", "CC→CV switch#", "CE#", "DCIR#", "Findings#")}
    >
      {runs.map((r) => {
        const cycle = r.delivered ? r.cycles.find((c) => c.cycle === r.delivered?.cycle) : undefined;
        const dcir = dcirOf({ dcirIecMohm: r.dcir.iec, dcirEdgeMohm: r.dcir.edge });
        return (
          <tr key={r.id} className="align-middle">
            <td className={cellClass()}>
              <Link href={`/runs/${r.id}`} className="font-medium text-copper-dark underline-offset-2 hover:underline">
                {formatDateTime(r.createdAt)}
              </Link>
              {r.testEndedAt ? <span className="block text-xs text-ink-soft">test ended {formatDateTime(r.testEndedAt)}</span> : null}
              <span className="mt-0.5 flex flex-wrap items-center gap-1.5 text-xs text-ink-soft">
                {r.purpose} <Badge tone={statusTone[r.status] ?? "neutral"}>{r.status}</Badge>
              </span>
              <span className="block max-w-56 truncate text-xs text-ink-soft" title={r.fileName}>
                {r.fileName}
              </span>
            </td>
            <td className={cellClass()}>
              {r.voltage ? <Sparkline x={r.voltage.x} y={r.voltage.y} label={`Voltage against time, run of ${formatDateTime(r.createdAt)}`} /> : <span className="text-xs text-ink-soft">{missing}</span>}
            </td>
            <td className={cellClass(true)}>{cycle ? formatMah(cycle.chargedMah) : formatMah(r.chargedMah)}</td>
            <td className={cellClass(true)}>
              {/* A discharge without a charge before it (a pulse test, a log from an unknown state) is no capacity. */}
              {r.delivered?.afterCharge ? (
                <>
                  {formatMah(r.delivered.mAh)}
                  <span className="block text-xs text-ink-soft">cycle {r.delivered.cycle}</span>
                </>
              ) : (
                <>
                  {missing}
                  {r.latestVersion !== null ? <span className="block text-xs text-ink-soft">no full cycle</span> : null}
                </>
              )}
            </td>
            <td className={cellClass(true)}>{r.switchVoltageV !== null ? formatVolts(r.switchVoltageV) : missing}</td>
            <td className={cellClass(true)}>{r.delivered?.afterCharge ? formatPercent(r.delivered.coulombicEfficiency, 2) : missing}</td>
            <td className={cellClass(true)}>{dcir ? formatMilliohm(dcir.medianMohm) : missing}</td>
            <td className={cellClass(true)}>
              {r.findingsCount === null ? missing : r.findingsCount}
              {r.safetyFindingsCount ? <span className="block text-xs font-semibold text-danger">{r.safetyFindingsCount} safety</span> : null}
            </td>
          </tr>
        );
      })}
    </SimpleTable>
  );
}
