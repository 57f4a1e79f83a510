import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { z } from "zod";
import { CycleCurves } from "@/components/charts/cycle-curves";
import { TemperatureChart, VoltageCurrentChart } from "@/components/charts/time-charts";
import { Badge, cellStatusTone, type BadgeTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listColumnMaps } from "@/lib/db/queries/column-maps";
import { deliveredCapacity, sohPercent } from "@/lib/charts/capacity";
import { plotView } from "@/lib/charts/plot-series";
import { getRunPage } from "@/lib/db/queries/notebook";
import { formatCelsius, formatClock, formatDateTime, formatMah, formatPercent, formatVolts, formatWh, missing, withUnit } from "@/lib/notebook/format";
import { isSafetyFinding } from "@/lib/notebook/findings";
import { reportView } from "@/lib/notebook/report-view";
import { batchHref, cellHref } from "@/lib/registry/links";
import { CycleTable } from "./_components/cycle-table";
import { DcirTable } from "./_components/dcir-table";
import { OtherFindings, SafetyFindings } from "./_components/findings";
import { RunNotes } from "./_components/run-notes";
import { ReanalyseForm } from "./_components/reanalyse-form";
import { RunStatusWatcher } from "./_components/run-status-watcher";
import { StepTable } from "./_components/step-table";
import { VersionPicker } from "./_components/version-picker";

type Props = { params: Promise<{ runId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

const versionParam = z.coerce.number().int().positive().optional();

/** A run id that is not a uuid names no run; checking first keeps it out of the query. */
const loadRun = cache(async (runId: string, version: number | undefined) => (z.uuid().safeParse(runId).success ? getRunPage(runId, version) : null));

async function resolve(props: Props) {
  const [{ runId }, search] = await Promise.all([props.params, props.searchParams]);
  const version = versionParam.safeParse(typeof search.version === "string" ? search.version : undefined);
  return loadRun(runId, version.success ? version.data : undefined);
}

export async function generateMetadata(props: Props): Promise<Metadata> {
  const page = await resolve(props);
  return { title: page ? `Run of ${page.detail.run.serial}` : "Run" };
}

const statusTone: Record<string, BadgeTone> = { queued: "neutral", analysing: "accent", complete: "good", failed: "bad" };

function fileSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KiB`;
  return `${(bytes / 1024 / 1024).toFixed(1)} MiB`;
}

export default async function RunPage(props: Props) {
  const [page, user] = await Promise.all([resolve(props), currentUser()]);
  if (!page) notFound();
  const { detail, cell, notes } = page;
  const mayAnalyse = Boolean(user && can(user.role, "run.analyse"));
  const savedMaps = user && mayAnalyse ? (await listColumnMaps(user.id)).map(({ id, name, ownerName }) => ({ id, name, ownerName })) : [];
  const { run, analysis } = detail;
  const report = analysis ? reportView(analysis.report) : null;
  const plot = plotView(detail.series);
  const safety = detail.findings.filter(isSafetyFinding);
  const others = detail.findings.filter((f) => !isSafetyFinding(f));
  const delivered = deliveredCapacity(detail.cycles);
  const duration = report?.totals.duration_s ?? 0;
  const rawHref = `/api/runs/${run.id}/raw`;
  const latest = run.latestVersion ?? 0;
  // The switch of the version on view, not of the latest analysis.
  const switchCycle = report?.cycles.find((c) => c.charge?.transition) ?? null;
  const transition = switchCycle?.charge?.transition ?? null;

  return (
    <>
      <PageTitle
        kicker="Run"
        title={
          <>
            <span className="font-mono">{run.serial}</span> · {run.purpose}
          </>
        }
        actions={
          <>
            <Badge tone={statusTone[run.status] ?? "neutral"}>{run.status}</Badge>
            <a href={rawHref} download className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Download the raw file
            </a>
            {run.status !== "failed" ? <a href={`/api/runs/${run.id}/bdf`} download className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">Download in Battery Data Format</a> : null}
          </>
        }
      />
      <div className="space-y-6">
        <Panel>
          <Facts
            items={[
              {
                label: "Cell",
                value: (
                  <span className="inline-flex items-center gap-2">
                    <Link href={cellHref(run.serial)} className="font-mono font-medium text-copper-dark underline-offset-2 hover:underline">
                      {run.serial}
                    </Link>
                    <Badge tone={cellStatusTone[cell.cellStatus]}>{cell.cellStatus}</Badge>
                  </span>
                ),
              },
              { label: "Cell type", value: `${cell.cellTypeName} (rated ${cell.ratedCapacityMah} mAh)` },
              {
                label: "Batch",
                value: cell.batchId ? (
                  <Link href={batchHref(cell.batchId)} className="text-copper-dark underline-offset-2 hover:underline">
                    {cell.lotCode}
                  </Link>
                ) : (
                  "none"
                ),
              },
              { label: "Purpose", value: run.purpose },
              { label: "Operator", value: run.uploadedByName ?? "unknown (account removed)" },
              { label: "Uploaded", value: `${formatDateTime(run.createdAt)} (${run.source === "api" ? "bench API" : "browser"})` },
              { label: "Test ended", value: run.testEndedAt ? formatDateTime(run.testEndedAt) : "not stated (taken as the upload time)" },
              { label: "Ambient temperature", value: formatCelsius(run.ambientTempC) },
              {
                label: "Analysis",
                value:
                  analysis && detail.versions.length > 1 ? (
                    <VersionPicker
                      versions={detail.versions.map((v) => ({ ...v, createdAt: v.createdAt.toISOString() }))}
                      current={analysis.version}
                      latest={latest}
                    />
                  ) : analysis ? (
                    `Version ${analysis.version} · engine ${analysis.engineVersion}`
                  ) : (
                    "not analysed yet"
                  ),
              },
              {
                label: "Raw file",
                value: (
                  <a href={rawHref} download className="break-all text-copper-dark underline-offset-2 hover:underline">
                    {run.fileName}
                  </a>
                ),
              },
              { label: "Size", value: fileSize(run.fileSize) },
              { label: "SHA-256 of the raw file", value: <code className="break-all font-mono text-xs">{run.sha256}</code> },
              { label: "Operator's note at upload", value: run.operatorNote || missing },
            ]}
          />
          {analysis && analysis.version !== latest ? (
            <p className="mt-4 rounded bg-warn-wash px-3 py-2 text-sm text-warn">
              You are looking at version {analysis.version}; version {latest} is the latest analysis of this file.
            </p>
          ) : null}
        </Panel>

        {run.status === "queued" || run.status === "analysing" ? (
          <Panel title="Analysis in progress">
            <RunStatusWatcher runId={run.id} status={run.status} />
          </Panel>
        ) : null}

        {run.status === "failed" && run.error ? (
          <section role="alert" aria-labelledby="run-error-title" className="rounded-lg border-2 border-danger bg-danger-wash/60 p-5">
            <h2 id="run-error-title" className="text-base font-semibold text-danger">
              The log could not be analysed
            </h2>
            <p className="mt-2 text-sm">{run.error.message}</p>
            <dl className="mt-3 grid grid-cols-2 gap-x-6 gap-y-1 text-sm sm:grid-cols-4">
              <dt className="text-ink-soft">File</dt>
              <dd className="break-all font-mono">{run.error.file ?? run.fileName}</dd>
              <dt className="text-ink-soft">Line</dt>
              <dd>{run.error.line ?? missing}</dd>
              <dt className="text-ink-soft">Column</dt>
              <dd>{run.error.column ?? missing}</dd>
              <dt className="text-ink-soft">Code</dt>
              <dd className="font-mono">{run.error.code}</dd>
            </dl>
            <p className="mt-3 text-sm">
              <a href={rawHref} download className="font-medium text-copper-dark underline">
                Download the raw file
              </a>{" "}
              to look at that line, then upload a corrected copy, or analyse it again below with a saved column map.
            </p>
          </section>
        ) : null}

        {analysis && !report ? (
          <Panel title="Results">
            <p className="text-sm text-danger">The stored report of this version is not in a shape this page can read. The raw file is unchanged and can be analysed again.</p>
          </Panel>
        ) : null}

        {report ? (
          <>
            <SafetyFindings findings={safety} />

            <Panel title="Key numbers">
              <Facts
                items={[
                  {
                    label: "Delivered capacity",
                    value: delivered
                      ? `${formatMah(delivered.mAh)} (cycle ${delivered.cycle}${delivered.afterCharge ? "" : ", no charge before it in this log"})`
                      : missing,
                  },
                  {
                    label: "SOH against rated",
                    value: delivered?.afterCharge ? withUnit(sohPercent(delivered.mAh, cell.ratedCapacityMah), 1, "%") : missing,
                  },
                  { label: "Charged in all", value: `${formatMah(report.totals.charged_mAh)} · ${formatWh(report.totals.charged_Wh)}` },
                  { label: "Discharged in all", value: `${formatMah(report.totals.discharged_mAh)} · ${formatWh(report.totals.discharged_Wh)}` },
                  // Whole-log efficiencies mislead when a log opens with a discharge from an unknown charge, so the capacity cycle's own are shown.
                  {
                    label: delivered?.afterCharge ? `Coulombic efficiency, cycle ${delivered.cycle}` : "Coulombic efficiency",
                    value: delivered?.afterCharge ? formatPercent(delivered.coulombicEfficiency, 2) : missing,
                  },
                  {
                    label: delivered?.afterCharge ? `Energy efficiency, cycle ${delivered.cycle}` : "Energy efficiency",
                    value: delivered?.afterCharge ? formatPercent(report.cycles.find((c) => c.cycle === delivered.cycle)?.energy_efficiency, 1) : missing,
                  },
                  { label: "Mean discharge voltage", value: formatVolts(report.totals.mean_discharge_voltage_V) },
                  {
                    label: report.cycles.length > 1 && switchCycle ? `CC→CV switch, cycle ${switchCycle.cycle}` : "CC→CV switch",
                    value: transition ? `${formatClock(transition.time_s)} · ${formatVolts(transition.voltage_V)} · ${formatMah(transition.capacity_mAh)}` : "none in this log",
                  },
                  { label: "Duration (h:mm:ss)", value: formatClock(report.totals.duration_s) },
                  { label: "Samples", value: `${report.totals.samples ?? missing}${report.totals.typical_interval_s ? `, every ${report.totals.typical_interval_s} s` : ""}` },
                  {
                    label: "Temperature",
                    value:
                      report.totals.max_temperature_C !== null
                        ? `${formatCelsius(report.totals.min_temperature_C)} to ${formatCelsius(report.totals.max_temperature_C)} (rise ${formatCelsius(report.totals.temperature_rise_C)})`
                        : "not logged",
                  },
                  { label: "Logging gaps", value: report.totals.logging_gaps ? `${report.totals.logging_gaps} (${formatClock(report.totals.uncounted_gap_s)} not counted)` : "none" },
                ]}
              />
            </Panel>

            <Panel title="Charts">
              <div className="space-y-8">
                {plot.voltage ? <VoltageCurrentChart plot={plot} durationS={duration} /> : <p className="text-sm text-ink-soft">No voltage trace was stored for this version.</p>}
                {plot.temperature ? <TemperatureChart plot={plot} durationS={duration} /> : null}
                <CycleCurves capacityCurves={plot.capacityCurves} icaCurves={plot.incrementalCapacity} initialCycle={delivered?.cycle ?? null} />
              </div>
            </Panel>

            <Panel title={`Cycles (${report.cycles.length})`}>
              {report.cycles.length ? <CycleTable cycles={report.cycles} ratedMah={cell.ratedCapacityMah} /> : <p className="text-sm text-ink-soft">No cycles.</p>}
              <p className="mt-2 text-xs text-ink-soft">
                A cycle is a charge followed by its discharge; a log that opens with a discharge starts with a cycle without a charge. Coulombic efficiency = charge out / charge in of
                the same cycle. Final CV current as C/x: x = rated capacity / current.
              </p>
            </Panel>

            <Panel title={`Steps (${report.steps.length})`}>
              <StepTable steps={report.steps} />
            </Panel>

            {report.dcir.length ? (
              <Panel title="DC resistance">
                <DcirTable results={report.dcir} edgesTotal={report.dcir_step_edges_total} />
              </Panel>
            ) : null}

            <OtherFindings findings={others} />
          </>
        ) : null}

        {mayAnalyse && (run.status === "complete" || run.status === "failed") ? (
          <Panel title="Analyse again">
            <p className="mb-3 text-sm text-ink-soft">
              After a fix to a column map, or to see this log with the current limits of its cell type. The raw file stays as it is; the new analysis is added as the next version.
            </p>
            <ReanalyseForm runId={run.id} maps={savedMaps} />
          </Panel>
        ) : null}

        <Panel title="Notes">
          <RunNotes runId={run.id} initial={notes} canWrite={Boolean(user && can(user.role, "note.write"))} />
        </Panel>
      </div>
    </>
  );
}
