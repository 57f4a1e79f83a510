import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { z } from "zod";
import { CapacityHistogramChart } from "@/components/charts/summary-charts";
import { FlagTable } from "@/components/health/flag-table";
import { CapabilityFacts, OutlierFacts, QualityCellTable } from "@/components/quality/quality-facts";
import { LotDecisionList } from "@/components/quality/lot-decision-list";
import { Badge, dispositionTone } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import { PageTitle, Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { histogramBars } from "@/lib/charts/histogram-bars";
import { flagsOf } from "@/lib/db/queries/flags";
import { getBatchQuality, listLotDecisions, type BatchQuality } from "@/lib/db/queries/quality";
import { batchCompareHref, batchQualityHref } from "@/lib/flags/links";
import { ensureOutboxSender } from "@/lib/mail/sender";
import { formatMah, formatMilliohm, formatNumber } from "@/lib/notebook/format";
import { batchHref, batchReportHref } from "@/lib/registry/links";
import { matchQuery } from "@/lib/validations/flags";
import { LotDecisionForm } from "./_components/lot-decision-form";

type Props = { params: Promise<{ batchId: string }>; searchParams: Promise<Record<string, string | string[] | undefined>> };


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
            <Link href={batchReportHref(batchId)} className={buttonClass()}>
              Printable lot report
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
              <LotDecisionList decisions={decisions} />
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
          <QualityCellTable q={q} />
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
