import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { z } from "zod";
import { CapacityHistogramChart } from "@/components/charts/summary-charts";
import { FlagTable } from "@/components/health/flag-table";
import { SignatureLine } from "@/components/signature/signature-line";
import { Badge, dispositionTone, type BadgeTone } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { histogramBars } from "@/lib/charts/histogram-bars";
import { flagsOf } from "@/lib/db/queries/flags";
import { getBatchQuality, listLotDecisions, type BatchQuality } from "@/lib/db/queries/quality";
import { batchCompareHref, batchQualityHref, cellHealthHref } from "@/lib/flags/links";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { formatDateTime, formatMah, formatMilliohm, formatNumber } from "@/lib/notebook/format";
import { formatCapacitySpec } from "@/lib/registry/format";
import { batchHref } from "@/lib/registry/links";
import type { CapabilityVerdict } from "@/lib/stats";
import { matchQuery } from "@/lib/validations/flags";
import { LotDecisionForm } from "./_components/lot-decision-form";

type Props = { params: Promise<{ batchId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };

const verdictTone: Record<CapabilityVerdict, BadgeTone> = { capable: "good", marginal: "warn", "not capable": "bad" };

const qualityOf = cache(async (batchId: string, setSize: number, capTol: number, dcirTol: number | null) =>
  z.uuid().safeParse(batchId).success ? getBatchQuality(batchId, { setSize, capacityTolerance_pct: capTol, dcirTolerance_pct: dcirTol }) : null,
);

async function load({ params, searchParams }: Props) {
  const { batchId } = await params;
  const raw = await searchParams;
  const parsed = matchQuery.safeParse(Object.fromEntries(Object.entries(raw).filter(([, v]) => typeof v === "string")));
  const match = parsed.success ? parsed.data : matchQuery.parse({});
  const dcirTol = match.ignoreDcir ? null : (match.dcirTol ?? 5);
  return { quality: await qualityOf(batchId, match.setSize, match.capTol, dcirTol), match };
}

export async function generateMetadata(props: Props): Promise<Metadata> {
  const { quality } = await load(props);
  return { title: quality ? `Quality of ${quality.batch.lotCode}` : "Batch quality" };
}

function CapabilityFacts({ q }: { q: BatchQuality }) {
  const s = q.report.summary;
  const c = q.report.capability;
  const below = q.report.cells.filter((x) => x.belowLsl).length;
  const above = q.report.cells.filter((x) => x.aboveUsl).length;
  return (
    <>
      <Facts
        items={[
          { label: "Cells measured", value: `${s?.n ?? 0} of ${q.delivered.length + q.unmeasured.length}` },
          { label: "Mean delivered capacity", value: formatMah(s?.mean) },
          { label: "Standard deviation", value: formatMah(s?.sd) },
          { label: "Coefficient of variation", value: s?.cv_pct === null || s?.cv_pct === undefined ? "—" : `${formatNumber(s.cv_pct, 2)} %` },
          { label: "Lowest / highest", value: `${formatMah(s?.min)} / ${formatMah(s?.max)}` },
          { label: "Capacity spec", value: formatCapacitySpec(q.batch.capacityLslMah, q.batch.capacityUslMah) },
          { label: "Outside the spec", value: `${below} below${q.batch.capacityUslMah !== null ? `, ${above} above` : ""}` },
          {
            label: c ? `Capability (${c.index})` : "Capability",
            value: c ? (
              <span className="flex items-center gap-2">
                <span className="font-semibold tabular-nums">{formatNumber(c.value, 2)}</span>
                <Badge tone={verdictTone[c.verdict]}>{c.verdict}</Badge>
              </span>
            ) : (
              "Needs at least two measured cells with some spread"
            ),
          },
          ...(c && c.cp !== null ? [{ label: "Cp / Cpk", value: `${formatNumber(c.cp, 2)} / ${formatNumber(c.cpk, 2)}` }] : []),
          ...(c ? [{ label: "Cpl / Cpu", value: `${formatNumber(c.cpl, 2)} / ${formatNumber(c.cpu, 2)}` }] : []),
        ]}
      />
      <p className="mt-3 text-xs text-ink-soft">
        NIST/SEMATECH e-Handbook §6.1.6: Cpl = (mean − LSL)/(3s), Cpu = (USL − mean)/(3s), Cp = (USL − LSL)/(6s), Cpk = min(Cpl, Cpu), with s the sample standard deviation of the batch. Below 1 not capable, 1 to 1.33 marginal, 1.33 and above capable. Delivered capacity is each cell&apos;s first capacity measurement.
      </p>
    </>
  );
}

function OutlierFacts({ q }: { q: BatchQuality }) {
  const f = q.report.fences;
  const g = q.report.grubbs;
  return (
    <div className="space-y-3 text-sm">
      {f ? (
        <p>
          Tukey fences (e-Handbook §7.1.6): Q1 {formatMah(f.q1)}, Q3 {formatMah(f.q3)}, IQR {formatMah(f.iqr)}; mild outliers outside {formatMah(f.lowerInner)} to {formatMah(f.upperInner)}, extreme outside {formatMah(f.lowerOuter)} to {formatMah(f.upperOuter)}.
        </p>
      ) : (
        <p className="text-ink-soft">No measured cells.</p>
      )}
      {g && g.steps.length ? (
        <SimpleTable caption="Grubbs test steps" headers={headersOf("Step#", "n#", "Suspect", "G#", "Critical#", "Outcome")}>
          {g.steps.map((step, i) => (
            <tr key={i}>
              <td className={cellClass(true)}>{i + 1}</td>
              <td className={cellClass(true)}>{step.n}</td>
              <td className={cellClass()}>{formatMah(step.suspectValue)}</td>
              <td className={cellClass(true)}>{formatNumber(step.g, 3)}</td>
              <td className={cellClass(true)}>{formatNumber(step.critical, 3)}</td>
              <td className={cellClass()}>{step.rejected ? "outlier" : "no outlier"}</td>
            </tr>
          ))}
        </SimpleTable>
      ) : (
        <p className="text-ink-soft">The Grubbs test needs at least 3 measured cells with some spread.</p>
      )}
      <p className="text-xs text-ink-soft">Grubbs (e-Handbook §1.3.5.17), two-sided at α = {g?.alpha ?? 0.05}, repeated after each outlier up to {g?.maxOutliers ?? 3}; it assumes normal data, and the handbook advises against it for 6 or fewer values.</p>
    </div>
  );
}

function MatchedSets({ q, batchId, match }: { q: BatchQuality; batchId: string; match: { setSize: number; capTol: number; dcirTol?: number; ignoreDcir: boolean } }) {
  const m = q.matching;
  const labelClass = "block text-xs font-semibold uppercase tracking-wide text-ink-soft";
  return (
    <div className="space-y-3">
      <form method="get" action={batchQualityHref(batchId)} className="flex flex-wrap items-end gap-3" aria-label="Matched-set settings">
        <label className="w-28">
          <span className={labelClass}>Cells per set</span>
          <input name="setSize" defaultValue={match.setSize} inputMode="numeric" className={inputClass} />
        </label>
        <label className="w-36">
          <span className={labelClass}>Capacity spread %</span>
          <input name="capTol" defaultValue={match.capTol} inputMode="decimal" className={inputClass} />
        </label>
        <label className="w-36">
          <span className={labelClass}>DCIR spread %</span>
          <input name="dcirTol" defaultValue={match.dcirTol ?? 5} inputMode="decimal" className={inputClass} />
        </label>
        <label className="flex items-center gap-2 pb-2 text-sm">
          <input type="checkbox" name="ignoreDcir" defaultChecked={match.ignoreDcir} /> Ignore DCIR
        </label>
        <button type="submit" className={buttonClass()}>
          Group
        </button>
      </form>
      {q.flaggedSerials.length ? (
        <p className="text-sm text-ink-soft">
          Left out while flagged: <span className="font-mono">{q.flaggedSerials.join(", ")}</span>
        </p>
      ) : null}
      {m === null ? (
        <p className="text-sm text-ink-soft">Needs at least {q.matchSettings.setSize} measured cells that are neither flagged nor retired.</p>
      ) : "error" in m ? (
        <p className="text-sm text-danger">{m.error}</p>
      ) : (
        <>
          <SimpleTable caption="Matched sets" headers={headersOf("Set#", "Cells", "Mean capacity#", "Capacity spread#", "Mean DCIR#", "DCIR spread#")}>
            {m.sets.map((set, i) => (
              <tr key={set.serials.join()}>
                <td className={cellClass(true)}>{i + 1}</td>
                <td className={`${cellClass()} font-mono`}>{set.serials.join(", ")}</td>
                <td className={cellClass(true)}>{formatMah(set.meanCapacity_mAh)}</td>
                <td className={cellClass(true)}>{formatNumber(set.capacitySpread_pct, 2)} %</td>
                <td className={cellClass(true)}>{formatMilliohm(set.meanDcir_mOhm)}</td>
                <td className={cellClass(true)}>{set.dcirSpread_pct === null ? "—" : `${formatNumber(set.dcirSpread_pct, 2)} %`}</td>
              </tr>
            ))}
          </SimpleTable>
          {m.leftOver.length ? (
            <ul className="list-disc pl-5 text-sm text-ink-soft">
              {m.leftOver.map((l) => (
                <li key={l.serial}>
                  <span className="font-mono">{l.serial}</span>: {l.reason}
                </li>
              ))}
            </ul>
          ) : null}
          <p className="text-xs text-ink-soft">
            Spread = (highest − lowest) / set mean. Capacity {m.capacityTolerance_pct} %{m.dcirTolerance_pct === null ? ", DCIR not checked" : `, DCIR ${m.dcirTolerance_pct} %`}: tolerances are vendor guidance for pack building, not a standard. A greedy grouping from the lowest capacity up; an exhaustive search might place a left-over cell.
          </p>
        </>
      )}
    </div>
  );
}

export default async function BatchQualityPage(props: Props) {
  const [{ quality: q, match }, user] = await Promise.all([load(props), currentUser()]);
  if (!q) notFound();
  ensureOutboxSender();
  const batchId = q.batch.id;
  const [flags, decisions] = await Promise.all([flagsOf({ batchId, unclosedOnly: true }), listLotDecisions(batchId)]);
  const bars = q.report.histogram ? histogramBars(q.report.histogram) : null;
  const byName = new Map(q.delivered.map((d) => [d.serial, d]));

  return (
    <>
      <PageTitle
        kicker={
          <Link href={batchHref(batchId)} className="hover:underline">
            Batch <span className="font-mono">{q.batch.lotCode}</span>
          </Link>
        }
        title="Quality of the lot"
        actions={
          <>
            <Badge tone={dispositionTone[q.batch.disposition]}>Decision: {q.batch.disposition}</Badge>
            <Link href={batchCompareHref([batchId])} className={buttonClass()}>
              Compare with other batches
            </Link>
          </>
        }
      />
      <div className="space-y-6">
        <div className="grid gap-6 lg:grid-cols-[1fr_24rem]">
          <Panel title="Delivered capacity and capability">
            <CapabilityFacts q={q} />
          </Panel>
          <div className="space-y-6">
            {user && can(user.role, "lot.decide") ? <LotDecisionForm batchId={batchId} disposition={q.batch.disposition} /> : null}
            <Panel title="Decisions">
              {decisions.length ? (
                <ol className="space-y-3 text-sm">
                  {decisions.map((d) => (
                    <li key={d.id}>
                      <span className="font-semibold">
                        {d.fromDisposition} → {d.disposition}
                      </span>{" "}
                      by {d.decidedByName}, {formatDateTime(d.decidedAt)}
                      <span className="block">{d.reason}</span>
                      <SignatureLine signature={d.signature} />
                      {d.figures ? (
                        <span className="block text-xs text-ink-soft">
                          In view: n = {d.figures.n}, mean {formatMah(d.figures.mean_mAh)}
                          {d.figures.capability ? `, ${d.figures.capability.index} ${formatNumber(d.figures.capability.value, 2)} (${d.figures.capability.verdict})` : ""}, {d.figures.unclosedFlags} flag{d.figures.unclosedFlags === 1 ? "" : "s"} not closed
                        </span>
                      ) : null}
                    </li>
                  ))}
                </ol>
              ) : (
                <p className="text-sm text-ink-soft">No decision yet: the lot is pending.</p>
              )}
            </Panel>
          </div>
        </div>
        {bars ? (
          <Panel>
            <CapacityHistogramChart bars={bars} />
          </Panel>
        ) : null}
        <Panel title="Outliers">
          <OutlierFacts q={q} />
        </Panel>
        <Panel title="Cells">
          <SimpleTable caption={`Cells of batch ${q.batch.lotCode} with their delivered capacity`} headers={headersOf("Cell", "Status", "Capacity#", "z#", "Tukey", "Grubbs", "Spec", "Fade per 100 cycles#", "DCIR#")}>
            {q.report.cells.map((c) => {
              const d = byName.get(c.serial);
              return (
                <tr key={c.serial}>
                  <td className={cellClass()}>
                    <Link href={cellHealthHref(c.serial)} className="font-mono text-copper-dark underline-offset-2 hover:underline">
                      {c.serial}
                    </Link>
                  </td>
                  <td className={cellClass()}>{d?.status ?? "—"}</td>
                  <td className={cellClass(true)}>{formatMah(c.capacity_mAh)}</td>
                  <td className={cellClass(true)}>{formatNumber(c.z, 2)}</td>
                  <td className={cellClass()}>{c.fence ?? "—"}</td>
                  <td className={cellClass()}>{c.grubbsOutlier ? "outlier" : ""}</td>
                  <td className={cellClass()}>{c.belowLsl ? "below" : c.aboveUsl ? "above" : "within"}</td>
                  <td className={cellClass(true)}>{d?.fadePer100Cycles_pctRated === null || d?.fadePer100Cycles_pctRated === undefined ? "—" : `${formatNumber(d.fadePer100Cycles_pctRated, 2)} %`}</td>
                  <td className={cellClass(true)}>{formatMilliohm(d?.dcir_mOhm)}</td>
                </tr>
              );
            })}
          </SimpleTable>
          {q.unmeasured.length ? (
            <p className="mt-3 text-sm text-ink-soft">
              Not measured yet: <span className="font-mono">{q.unmeasured.map((u) => u.serial).join(", ")}</span>
            </p>
          ) : null}
        </Panel>
        <section aria-labelledby="batch-flags-title" className="space-y-3">
          <h2 id="batch-flags-title" className="text-base font-semibold">
            Flags not yet closed in this batch
          </h2>
          {flags.length ? <FlagTable flags={flags} caption={`Flags of batch ${q.batch.lotCode}`} /> : <p className="text-sm text-ink-soft">None.</p>}
        </section>
        <Panel title="Matched sets for series packs">
          <MatchedSets q={q} batchId={batchId} match={match} />
        </Panel>
      </div>
    </>
  );
}
