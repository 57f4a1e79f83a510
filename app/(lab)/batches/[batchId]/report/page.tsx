import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { z } from "zod";
import { CapacityHistogramChart } from "@/components/charts/summary-charts";
import { FlagTable } from "@/components/health/flag-table";
import { CapabilityFacts, OutlierFacts, QualityCellTable } from "@/components/quality/quality-facts";
import { LotDecisionList } from "@/components/quality/lot-decision-list";
import { ReportSection, ReportSheet } from "@/components/report/report-sheet";
import { SafetyCautions } from "@/components/safety-cautions";
import { Facts } from "@/components/ui/facts";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { histogramBars } from "@/lib/charts/histogram-bars";
import { flagsOf } from "@/lib/db/queries/flags";
import { getBatchQuality, listLotDecisions } from "@/lib/db/queries/quality";
import { formatUtc } from "@/lib/notebook/format";
import { formatCapacitySpec } from "@/lib/registry/format";
import { auditTrailHref, batchHref, cellReportHref } from "@/lib/registry/links";

type Params = { params: Promise<{ batchId: string }> };

const qualityOf = cache(async (batchId: string) => (z.uuid().safeParse(batchId).success ? getBatchQuality(batchId) : null));

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const q = await qualityOf((await params).batchId);
  return { title: q ? `Report on lot ${q.batch.lotCode}` : "Batch report" };
}

/** The printable record of a lot: its spec, the capability and outlier statistics, its cells, open flags and signed decisions. */
export default async function BatchReportPage({ params }: Params) {
  const [q, user] = await Promise.all([qualityOf((await params).batchId), currentUser()]);
  if (!q || !user) notFound();
  const { batch } = q;
  const [flags, decisions] = await Promise.all([flagsOf({ batchId: batch.id, unclosedOnly: true }), listLotDecisions(batch.id)]);
  const bars = q.report.histogram ? histogramBars(q.report.histogram) : null;
  const safetyFlags = flags.filter((f) => f.kind === "safety-danger");

  return (
    <ReportSheet
      kind="Lot report"
      subject={<span className="font-mono">{batch.lotCode}</span>}
      back={{ href: batchHref(batch.id), label: `Back to batch ${batch.lotCode}` }}
      printedBy={user}
    >
      <ReportSection title="The lot">
        <Facts
          items={[
            { label: "Decision", value: batch.disposition },
            { label: "Cell type", value: batch.cellTypeName },
            { label: "Supplier", value: batch.supplier },
            { label: "Received", value: batch.receivedOn },
            { label: "Cells registered / ordered", value: `${batch.registeredCells} / ${batch.quantity}` },
            { label: "Rated capacity", value: `${q.ratedCapacityMah} mAh` },
            { label: "Capacity spec", value: formatCapacitySpec(batch.capacityLslMah, batch.capacityUslMah) },
          ]}
        />
      </ReportSection>

      <ReportSection title="Safety">
        {safetyFlags.length ? (
          <p className="mb-3 rounded-md border-2 border-danger px-3 py-2 text-sm font-semibold text-danger" role="alert">
            {safetyFlags.length} cell{safetyFlags.length === 1 ? "" : "s"} of this lot recorded an unsafe condition that is not yet closed: {safetyFlags.map((f) => f.serial).join(", ")}.
          </p>
        ) : (
          <p className="mb-3 text-sm">No unsafe condition is open on a cell of this lot.</p>
        )}
        <SafetyCautions />
      </ReportSection>

      <ReportSection title="Delivered capacity and capability">
        <CapabilityFacts q={q} />
        {bars ? (
          <div className="mt-4">
            <CapacityHistogramChart bars={bars} />
          </div>
        ) : null}
      </ReportSection>

      <ReportSection title="Outliers">
        <OutlierFacts q={q} />
      </ReportSection>

      <ReportSection title="Cells">
        <QualityCellTable q={q} />
        <p className="mt-2 text-xs text-ink-soft">
          Each cell&apos;s own report, with its runs, fade and record history:{" "}
          {[...q.delivered.map((d) => d.serial), ...q.unmeasured.map((u) => u.serial)].map((serial, i) => (
            <span key={serial}>
              {i ? ", " : ""}
              <Link href={cellReportHref(serial)} className="font-mono text-copper-dark underline-offset-2 hover:underline">
                {serial}
              </Link>
            </span>
          ))}
          .
        </p>
      </ReportSection>

      <ReportSection title="Flags not yet closed">
        {flags.length ? <FlagTable flags={flags} caption={`Flags not yet closed in lot ${batch.lotCode}`} /> : <p className="text-sm">None.</p>}
      </ReportSection>

      <ReportSection title="Decisions and signatures">
        <LotDecisionList decisions={decisions} formatWhen={formatUtc} />
        {can(user.role, "audit.read") ? (
          <p className="mt-2 text-xs text-ink-soft">
            Every change to this lot and its cells is on the{" "}
            <Link href={auditTrailHref(batch.lotCode)} className="text-copper-dark underline-offset-2 hover:underline">
              audit trail
            </Link>
            .
          </p>
        ) : null}
      </ReportSection>
    </ReportSheet>
  );
}
