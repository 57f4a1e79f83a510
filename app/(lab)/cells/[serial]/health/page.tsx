import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { FadeChart } from "@/components/health/fade-chart";
import { FadeFacts, KneeFacts } from "@/components/health/fade-facts";
import { FlagTable } from "@/components/health/flag-table";
import { RaiseFlagForm } from "@/components/health/raise-flag-form";
import { SafetyCautions } from "@/components/safety-cautions";
import { Badge, cellStatusTone } from "@/components/ui/badge";
import { PageTitle, Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { getCellHealth } from "@/lib/db/queries/fade";
import { runHref } from "@/lib/flags/links";
import { serialFromParam } from "@/lib/health/params";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { formatDateTime, formatMah, formatMilliohm, formatNumber, formatPercent } from "@/lib/notebook/format";
import { cellHref, cellReportHref } from "@/lib/registry/links";

type Params = { params: Promise<{ serial: string }> };

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  return { title: `Health of ${serialFromParam((await params).serial) ?? "a cell"}` };
}

export default async function CellHealthPage({ params }: Params) {
  const serial = serialFromParam((await params).serial);
  const [health, user] = await Promise.all([serial ? getCellHealth(serial) : null, currentUser()]);
  if (!health) notFound();
  ensureOutboxSender();
  const { cell, measurements, fade } = health;
  const chart = fade?.fade.chart ?? null;
  const knee = fade?.knee?.significant ? { x: fade.knee.knee, y: fade.knee.kneeY } : null;
  const last = fade?.fade.points.at(-1);

  return (
    <>
      <PageTitle
        kicker={
          <Link href={cellHref(cell.serial)} className="hover:underline">
            Cell <span className="font-mono">{cell.serial}</span>
          </Link>
        }
        title="Capacity fade and health"
        actions={
          <>
            <Badge tone={cellStatusTone[cell.status]}>{cell.status}</Badge>
            <Link href={cellReportHref(cell.serial)} className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Printable cell report
            </Link>
          </>
        }
      />
      <div className="space-y-6">
        {health.flags.some((f) => f.kind === "safety-danger" && f.state !== "cleared") || health.dangers.length > 0 ? <SafetyCautions compact /> : null}
        {measurements.capacity.length === 0 ? (
          <Panel title="No capacity measurements yet">
            <p className="text-sm text-ink-soft">
              Capacity points come from capacity-check runs (the discharge after the declared charge) and cycle-life runs (every full cycle). Upload one and its analysis appears here.
            </p>
          </Panel>
        ) : (
          <>
            <Panel title="State of health and fade">
              <FadeFacts health={health} />
            </Panel>
            {chart ? (
              <Panel>
                <FadeChart
                  chart={chart}
                  eolThresholdPct={health.eolThresholdPct}
                  knee={knee}
                  summary={`${chart.measured.length} capacity measurements of cell ${cell.serial}, latest ${formatMah(last?.capacity_mAh)} (${formatPercent(last?.sohRated)} of rated), with the least-squares line${chart.projection.length ? " carried on to the end-of-life threshold" : ""} at ${formatMah(chart.threshold_mAh)}${knee ? `; knee at cycle ${Math.round(knee.x)}` : ""}.`}
                />
              </Panel>
            ) : null}
            <Panel title="Knee point (Bacon–Watts)">
              <KneeFacts health={health} />
            </Panel>
          </>
        )}
        <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
          <section aria-labelledby="cell-flags-title" className="space-y-3">
            <h2 id="cell-flags-title" className="text-base font-semibold">
              Flags of this cell
            </h2>
            {health.flags.length ? <FlagTable flags={health.flags} caption={`Flags of cell ${cell.serial}`} showCell={false} /> : <p className="text-sm text-ink-soft">No flags.</p>}
          </section>
          {user && can(user.role, "flag.raise") && cell.status !== "retired" ? <RaiseFlagForm serial={cell.serial} /> : null}
        </div>
        {fade ? (
          <Panel title="Capacity measurements">
            <SimpleTable caption={`Capacity measurements of cell ${cell.serial}`} headers={headersOf("Cycle#", "Date", "Capacity#", "Of rated#", "Of first#", "Run")}>
              {fade.fade.points.map((p, i) => {
                const point = measurements.capacity[i];
                return (
                  <tr key={`${p.cycle}-${i}`}>
                    <td className={cellClass(true)}>{p.cycle}</td>
                    <td className={cellClass()}>{p.date ? formatDateTime(p.date) : "—"}</td>
                    <td className={cellClass(true)}>{formatMah(p.capacity_mAh)}</td>
                    <td className={cellClass(true)}>{formatPercent(p.sohRated)}</td>
                    <td className={cellClass(true)}>{formatPercent(p.sohFirst)}</td>
                    <td className={cellClass()}>
                      {point ? (
                        <Link href={runHref(point.runId)} className="text-copper-dark underline-offset-2 hover:underline">
                          run
                        </Link>
                      ) : null}
                    </td>
                  </tr>
                );
              })}
            </SimpleTable>
          </Panel>
        ) : null}
        {measurements.resistance.length ? (
          <Panel title="DC resistance">
            {health.resistanceRise ? (
              <p className="mb-3 text-sm">
                Latest {formatMilliohm(health.resistanceRise.latest.median_mOhm)} against the first {formatMilliohm(health.resistanceRise.first.median_mOhm)} by the same method: {formatNumber(health.resistanceRise.risePct, 1)} % rise.
              </p>
            ) : null}
            <SimpleTable caption={`DC resistance of cell ${cell.serial} by run`} headers={headersOf("Test ended", "Method", "Median#", "Results#", "Run")}>
              {measurements.resistance.map((r) => (
                <tr key={r.runId}>
                  <td className={cellClass()}>{formatDateTime(r.at)}</td>
                  <td className={cellClass()}>{r.method === "step-edge" ? "step edge" : "IEC 61960-3 two-current"}</td>
                  <td className={cellClass(true)}>{formatMilliohm(r.median_mOhm)}</td>
                  <td className={cellClass(true)}>{r.n}</td>
                  <td className={cellClass()}>
                    <Link href={runHref(r.runId)} className="text-copper-dark underline-offset-2 hover:underline">
                      run
                    </Link>
                  </td>
                </tr>
              ))}
            </SimpleTable>
          </Panel>
        ) : null}
        {measurements.efficiency.length ? (
          <Panel title="Coulombic efficiency">
            <SimpleTable caption={`Lowest coulombic efficiency per run of cell ${cell.serial}`} headers={headersOf("Test ended", "Purpose", "Lowest#", "In cycle#", "Cycles#")}>
              {measurements.efficiency.map((e) => (
                <tr key={e.runId}>
                  <td className={cellClass()}>{formatDateTime(e.at)}</td>
                  <td className={cellClass()}>{e.purpose}</td>
                  <td className={cellClass(true)}>{formatPercent(e.min, 2)}</td>
                  <td className={cellClass(true)}>{e.cycle}</td>
                  <td className={cellClass(true)}>{e.cycles}</td>
                </tr>
              ))}
            </SimpleTable>
          </Panel>
        ) : null}
        <Panel title="How these figures are made">
          <ul className="list-disc space-y-1 pl-5 text-sm text-ink-soft">
            <li>Runs count in the order their tests ended (as stated on upload, else the upload time); every full cycle (a charge, then a discharge) of every run advances the cell&apos;s cycle count.</li>
            <li>A capacity check gives one point, the discharge after its last charge; a cycle-life run gives one point per full cycle. A discharge from an unknown state of charge is not a point.</li>
            <li>Fade is the least-squares slope of capacity on cycle, with its standard error and a t-based 95 % interval; the end-of-life cycle is where that line reaches the threshold, with a Fieller interval.</li>
            <li>A point&apos;s date is its run&apos;s test end (or upload time) less the time from the discharge&apos;s end to the end of the log.</li>
            <li>The knee is the Bacon–Watts change point (Fermín-Cueto et al., Energy and AI 1 (2020) 100006), kept only when an F-test against a straight line rejects the line at the 1 % level.</li>
          </ul>
        </Panel>
      </div>
    </>
  );
}
