import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CurveOverlay } from "@/components/charts/curve-overlay";
import { CapacityByCycleChart, CapacityByDateChart } from "@/components/charts/summary-charts";
import { Badge, cellStatusTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { capacityByDate, isFullCycle } from "@/lib/charts/capacity";
import { getCellNotebook, getDischargeCurvePayload } from "@/lib/db/queries/notebook";
import { cellHealthHref } from "@/lib/flags/links";
import { getCellBySerial, getCellType } from "@/lib/db/queries/registry";
import { formatDateTime, formatMah, formatMilliohm, formatPercent, missing, withUnit } from "@/lib/notebook/format";
import { formatTermination } from "@/lib/registry/format";
import { batchHref, cellReportHref } from "@/lib/registry/links";
import { identifierField } from "@/lib/validations/fields";
import { CellRuns } from "./_components/cell-runs";

type Params = { params: Promise<{ serial: string }> };

const serialParam = identifierField("Serial");

/** Page params arrive still percent-encoded; "%" is not a serial character, so one decode is exact. */
async function serialFrom(params: Params["params"]): Promise<string | null> {
  const { serial } = await params;
  let decoded: string;
  try {
    decoded = decodeURIComponent(serial);
  } catch {
    return null;
  }
  const parsed = serialParam.safeParse(decoded);
  return parsed.success ? parsed.data : null;
}

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  return { title: (await serialFrom(params)) ?? "Cell" };
}

/** Runs drawn over each other at first: the newest few with a discharge, so the page opens with a comparison. */
const initialOverlay = 3;

export default async function CellPage({ params }: Params) {
  const serial = await serialFrom(params);
  const [cell, user] = await Promise.all([serial ? getCellBySerial(serial) : null, currentUser()]);
  if (!cell) notFound();
  const [type, notebook] = await Promise.all([getCellType(cell.cellTypeId), getCellNotebook(cell.serial)]);
  const runs = notebook?.runs ?? [];
  const figures = notebook?.figures;
  // The file name tells apart runs uploaded in the same minute.
  const label = (r: { createdAt: Date; purpose: string; fileName: string }) => `${formatDateTime(r.createdAt)} · ${r.purpose} · ${r.fileName}`;
  const withCurve = runs.filter((r) => r.delivered?.afterCharge).map((r) => ({ runId: r.id, label: label(r) }));
  const initial = withCurve.slice(0, initialOverlay).map((o) => o.runId);
  const prefetched = (await Promise.all(initial.map((id) => getDischargeCurvePayload(id)))).filter((p) => p !== null);
  const byDate = capacityByDate(runs.map((r) => ({ at: r.testEndedAt ?? r.createdAt, deliveredMah: r.delivered?.afterCharge ? r.delivered.mAh : null })));
  const multiCycle = runs.filter((r) => r.cycles.filter(isFullCycle).length >= 2).map((r) => ({ label: label(r), cycles: r.cycles }));
  const mayUpload = Boolean(user && can(user.role, "run.upload"));

  return (
    <>
      <PageTitle
        kicker="Cell"
        title={<span className="font-mono">{cell.serial}</span>}
        actions={
          <>
            <Badge tone={cellStatusTone[cell.status]}>{cell.status}</Badge>
            <Link href={cellHealthHref(cell.serial)} className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Health, fade and flags
            </Link>
            <Link href={cellReportHref(cell.serial)} className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Printable cell report
            </Link>
          </>
        }
      />
      <div className="space-y-6">
        <Panel title="Summary">
          <Facts
            items={[
              {
                label: "Latest delivered capacity",
                value: figures?.delivered ? (
                  <>
                    <Link href={`/runs/${figures.delivered.runId}`} className="font-semibold text-copper-dark underline-offset-2 hover:underline">
                      {formatMah(figures.delivered.mAh)}
                    </Link>{" "}
                    <span className="text-ink-soft">on {formatDateTime(figures.delivered.at)}</span>
                  </>
                ) : (
                  "not measured yet"
                ),
              },
              {
                label: "SOH against rated",
                value: figures?.sohPercent !== null && figures?.sohPercent !== undefined ? `${withUnit(figures.sohPercent, 1, "%")} of ${type?.ratedCapacityMah ?? missing} mAh` : missing,
              },
              { label: "Coulombic efficiency of that cycle", value: formatPercent(figures?.coulombicEfficiency, 2) },
              { label: "DC resistance, latest", value: figures?.dcir ? `${formatMilliohm(figures.dcir.medianMohm)} (${figures.dcir.method})` : missing },
              { label: "Status", value: <Badge tone={cellStatusTone[cell.status]}>{cell.status}</Badge> },
              {
                label: "Open flags",
                value: notebook ? (
                  <Link href={cellHealthHref(cell.serial)} className="underline-offset-2 hover:underline">
                    {notebook.openFlags}
                  </Link>
                ) : (
                  missing
                ),
              },
              { label: "Runs", value: String(runs.length) },
              { label: "Last tested", value: figures?.lastTestedAt ? formatDateTime(figures.lastTestedAt) : "never" },
            ]}
          />
        </Panel>

        <Panel title={`Runs (${runs.length})`}>
          {runs.length ? (
            <CellRuns runs={runs} serial={cell.serial} />
          ) : (
            <p className="text-sm text-ink-soft">
              No runs yet:{" "}
              {mayUpload ? (
                <>
                  upload a bench log of this cell on the{" "}
                  <Link href="/upload" className="font-medium text-copper-dark underline">
                    Upload page
                  </Link>
                  .
                </>
              ) : (
                "a technician uploads the bench logs of this cell on the Upload page."
              )}
            </p>
          )}
        </Panel>

        {runs.length ? (
          <Panel title="Capacity over time">
            <div className="grid gap-8 xl:grid-cols-2">
              {byDate.x.length ? (
                <CapacityByDateChart x={byDate.x} y={byDate.y} ratedMah={type?.ratedCapacityMah ?? null} />
              ) : (
                <p className="text-sm text-ink-soft">No run of this cell has a full cycle (a charge, then a discharge) yet.</p>
              )}
              {multiCycle.length ? (
                <CapacityByCycleChart runs={multiCycle} />
              ) : (
                <p className="text-sm text-ink-soft">Capacity per cycle appears here for logs with several full cycles, such as a cycle-life test.</p>
              )}
            </div>
          </Panel>
        ) : null}

        {runs.length ? (
          <Panel title="Discharge curves">
            <CurveOverlay options={withCurve} initial={initial} prefetched={prefetched} title={`Voltage against delivered capacity, cell ${cell.serial}`} />
          </Panel>
        ) : null}

        <Panel title="Registry">
          <Facts
            items={[
              { label: "Status", value: cell.status },
              {
                label: "Batch",
                value: cell.batchId ? (
                  <Link href={batchHref(cell.batchId)} className="text-copper-dark underline-offset-2 hover:underline">
                    {cell.lotCode}
                  </Link>
                ) : (
                  "No batch (registered on its own)"
                ),
              },
              { label: "Cell type", value: cell.cellTypeName },
              { label: "Registered", value: cell.createdAt.toLocaleDateString("en-CA") },
            ]}
          />
        </Panel>
        {type ? (
          <Panel title={`Limits of ${type.name}`}>
            <Facts
              items={[
                { label: "Rated capacity", value: `${type.ratedCapacityMah} mAh` },
                { label: "Nominal voltage", value: `${type.nominalVoltageV} V` },
                { label: "Charge voltage limit", value: `${type.chargeVoltageLimitV} V` },
                { label: "Discharge cut-off", value: `${type.dischargeCutoffV} V` },
                { label: "Charge C-rate, at most", value: `${type.maxChargeC}C` },
                { label: "Discharge C-rate, at most", value: `${type.maxDischargeC}C` },
                { label: "Charge ends at", value: formatTermination(type.terminationC) },
              ]}
            />
          </Panel>
        ) : null}
      </div>
    </>
  );
}
