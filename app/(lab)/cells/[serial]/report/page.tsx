import type { Metadata } from "next";
import Link from "next/link";
import { Fragment } from "react";
import { notFound } from "next/navigation";
import { FadeChart } from "@/components/health/fade-chart";
import { FadeFacts, KneeFacts } from "@/components/health/fade-facts";
import { FlagStateBadge } from "@/components/health/flag-badges";
import { FlagHistoryTable } from "@/components/health/flag-history-table";
import { LotDecisionList } from "@/components/quality/lot-decision-list";
import { RecordHistory } from "@/components/report/record-history";
import { ReportSection, ReportSheet } from "@/components/report/report-sheet";
import { SafetyCautions } from "@/components/safety-cautions";
import { Facts } from "@/components/ui/facts";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listCellHistory } from "@/lib/db/queries/audit";
import { getCellHealth } from "@/lib/db/queries/fade";
import { getFlagDetail } from "@/lib/db/queries/flags";
import { getCellNotebook } from "@/lib/db/queries/notebook";
import { listLotDecisions } from "@/lib/db/queries/quality";
import { getCellType } from "@/lib/db/queries/registry";
import { flagHref, runHref } from "@/lib/flags/links";
import { kindTitle } from "@/lib/flags/vocabulary";
import { serialFromParam } from "@/lib/health/params";
import { formatMah, formatMilliohm, formatPercent, formatUtc, missing, withUnit } from "@/lib/notebook/format";
import { formatTermination } from "@/lib/registry/format";
import { auditTrailHref, cellHref } from "@/lib/registry/links";

type Params = { params: Promise<{ serial: string }> };

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  return { title: `Report on ${serialFromParam((await params).serial) ?? "a cell"}` };
}

/**
 * The printable record of one cell: what it is, what was measured, what the statistics say, what
 * was found and flagged, who signed what, and (for those who may read the audit trail) every
 * change from its registration on.
 */
export default async function CellReportPage({ params }: Params) {
  const serial = serialFromParam((await params).serial);
  const [health, notebook, user] = await Promise.all([serial ? getCellHealth(serial) : null, serial ? getCellNotebook(serial) : null, currentUser()]);
  if (!health || !user) notFound();
  const { cell, fade, measurements } = health;
  const mayAudit = can(user.role, "audit.read");
  const [type, flagDetails, decisions, history] = await Promise.all([
    getCellType(cell.cellTypeId),
    Promise.all(health.flags.map((f) => getFlagDetail(f.id))),
    cell.batchId ? listLotDecisions(cell.batchId) : Promise.resolve([]),
    mayAudit ? listCellHistory(cell.id) : Promise.resolve(null),
  ]);
  const runs = notebook?.runs ?? [];
  const figures = notebook?.figures;
  const chart = fade?.fade.chart ?? null;
  const knee = fade?.knee?.significant ? { x: fade.knee.knee, y: fade.knee.kneeY } : null;
  const last = fade?.fade.points.at(-1);
  const safetyRuns = runs.filter((r) => (r.safetyFindingsCount ?? 0) > 0).length;

  return (
    <ReportSheet
      kind="Cell report"
      subject={<span className="font-mono">{cell.serial}</span>}
      back={{ href: cellHref(cell.serial), label: `Back to cell ${cell.serial}` }}
      printedBy={user}
    >
      <ReportSection title="The cell">
        <Facts
          items={[
            { label: "Status", value: cell.status },
            { label: "Cell type", value: cell.cellTypeName },
            { label: "Batch", value: cell.lotCode ?? "none (registered on its own)" },
            { label: "Registered", value: formatUtc(cell.createdAt) },
            { label: "Rated capacity", value: type ? `${type.ratedCapacityMah} mAh` : missing },
            { label: "Nominal voltage", value: type ? `${type.nominalVoltageV} V` : missing },
            { label: "Charge limit / cut-off", value: type ? `${type.chargeVoltageLimitV} V / ${type.dischargeCutoffV} V` : missing },
            { label: "Charge ends at", value: type ? formatTermination(type.terminationC) : missing },
          ]}
        />
      </ReportSection>

      <ReportSection title="Safety">
        {health.dangers.length ? (
          <div className="mb-3 rounded-md border-2 border-danger px-3 py-2 text-sm" role="alert">
            <p className="font-semibold text-danger">Unsafe conditions were recorded on this cell</p>
            <ul className="mt-1 list-disc space-y-1 pl-5">
              {health.dangers.map((d, i) => (
                <li key={`${d.analysisId}-${i}`}>
                  {d.message}{" "}
                  <Link href={runHref(d.runId)} className="text-copper-dark underline-offset-2 hover:underline">
                    (run)
                  </Link>
                  <span className="block text-xs">{d.caution}</span>
                </li>
              ))}
            </ul>
          </div>
        ) : (
          <p className="mb-3 text-sm">No run of this cell recorded an unsafe condition (over-voltage, over-temperature or the like).</p>
        )}
        <SafetyCautions />
      </ReportSection>

      <ReportSection title="Latest figures">
        <Facts
          items={[
            { label: "Latest delivered capacity", value: figures?.delivered ? `${formatMah(figures.delivered.mAh)} on ${formatUtc(figures.delivered.at)}` : "not measured yet" },
            { label: "SOH against rated", value: figures?.sohPercent !== null && figures?.sohPercent !== undefined ? withUnit(figures.sohPercent, 1, "%") : missing },
            { label: "Coulombic efficiency", value: formatPercent(figures?.coulombicEfficiency, 2) },
            { label: "DC resistance", value: figures?.dcir ? `${formatMilliohm(figures.dcir.medianMohm)} (${figures.dcir.method})` : missing },
            { label: "Full cycles counted", value: String(measurements.totalCycles) },
            { label: "Runs", value: String(runs.length) },
            { label: "Runs with safety findings", value: String(safetyRuns) },
            { label: "Flags, all states", value: String(health.flags.length) },
          ]}
        />
      </ReportSection>

      <ReportSection title="Capacity fade">
        {fade ? (
          <div className="space-y-4">
            <FadeFacts health={health} />
            {chart ? (
              <FadeChart
                chart={chart}
                eolThresholdPct={health.eolThresholdPct}
                knee={knee}
                summary={`${chart.measured.length} capacity measurements of cell ${cell.serial}, latest ${formatMah(last?.capacity_mAh)} (${formatPercent(last?.sohRated)} of rated), with the least-squares line and the end-of-life threshold at ${formatMah(chart.threshold_mAh)}.`}
              />
            ) : null}
            <h3 className="text-sm font-semibold">Knee point (Bacon–Watts)</h3>
            <KneeFacts health={health} />
          </div>
        ) : (
          <p className="text-sm">No capacity measurement yet: capacity points come from capacity-check and cycle-life runs.</p>
        )}
      </ReportSection>

      <ReportSection title="Runs">
        {runs.length ? (
          <SimpleTable caption={`Runs of cell ${cell.serial}, newest first`} headers={headersOf("Test ended", "Purpose", "Status", "Charged#", "Delivered#", "Findings#")}>
            {runs.map((r) => (
              <Fragment key={r.id}>
                <tr className="align-top">
                  <td className="px-3 pt-2 whitespace-nowrap">
                    <Link href={runHref(r.id)} className="text-copper-dark underline-offset-2 hover:underline">
                      {r.testEndedAt ? formatUtc(r.testEndedAt) : "not stated"}
                    </Link>
                    <span className="block text-xs text-ink-soft">
                      uploaded {formatUtc(r.createdAt)} by {r.uploadedByName ?? "—"}
                    </span>
                  </td>
                  <td className="px-3 pt-2">{r.purpose}</td>
                  <td className="px-3 pt-2">{r.status}</td>
                  <td className="px-3 pt-2 text-right tabular-nums">{formatMah(r.chargedMah)}</td>
                  <td className="px-3 pt-2 text-right tabular-nums">{r.delivered ? formatMah(r.delivered.mAh) : formatMah(r.dischargedMah)}</td>
                  <td className="px-3 pt-2 text-right tabular-nums">
                    {r.findingsCount ?? "—"}
                    {r.safetyFindingsCount ? <span className="block text-xs font-semibold text-danger">{r.safetyFindingsCount} safety</span> : null}
                  </td>
                </tr>
                {/* The file and its hash on a line of their own: a 64-digit hash does not fit a column. */}
                <tr>
                  <td colSpan={6} className={`${cellClass()} pt-0 text-xs text-ink-soft [overflow-wrap:anywhere]`}>
                    {r.fileName} · SHA-256 <span className="font-mono">{r.sha256}</span>
                  </td>
                </tr>
              </Fragment>
            ))}
          </SimpleTable>
        ) : (
          <p className="text-sm">No runs yet.</p>
        )}
      </ReportSection>

      <ReportSection title="Flags and their signatures">
        {flagDetails.length ? (
          <div className="space-y-4">
            {flagDetails.map((f) =>
              f ? (
                <div key={f.id} className="report-section space-y-1">
                  <p className="flex flex-wrap items-center gap-2 text-sm">
                    <FlagStateBadge state={f.state} />
                    <Link href={flagHref(f.id)} className="font-semibold text-copper-dark underline-offset-2 hover:underline">
                      {kindTitle(f.kind)}
                    </Link>
                    <span>{f.summary}</span>
                  </p>
                  <FlagHistoryTable transitions={f.transitions} caption={`Steps of the ${kindTitle(f.kind)} flag`} formatWhen={formatUtc} />
                </div>
              ) : null,
            )}
          </div>
        ) : (
          <p className="text-sm">No flags were raised on this cell.</p>
        )}
      </ReportSection>

      {cell.batchId ? (
        <ReportSection title={`Decisions on lot ${cell.lotCode ?? ""}`}>
          <LotDecisionList decisions={decisions} formatWhen={formatUtc} />
        </ReportSection>
      ) : null}

      {history ? (
        <ReportSection title="Record history">
          <RecordHistory events={history.events} truncated={history.truncated} caption={`Every recorded change to cell ${cell.serial}, its runs and its flags, oldest first`} auditHref={auditTrailHref(cell.serial)} />
        </ReportSection>
      ) : null}
    </ReportSheet>
  );
}
