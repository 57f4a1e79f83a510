import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache, Suspense } from "react";
import { z } from "zod";
import { CurveOverlay } from "@/components/charts/curve-overlay";
import { CapacityHistogramChart } from "@/components/charts/summary-charts";
import { Badge, dispositionTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { histogramBars } from "@/lib/charts/histogram-bars";
import { getBatchCellRows, getDischargeCurvePayload } from "@/lib/db/queries/notebook";
import { getBatch } from "@/lib/db/queries/registry";
import { batchReportHref } from "@/lib/registry/links";
import { batchQualityHref } from "@/lib/flags/links";
import { pageOfCellRows, type BatchCellRow } from "@/lib/notebook/batch-rows";
import { formatMah } from "@/lib/notebook/format";
import { formatCapacitySpec } from "@/lib/registry/format";
import { histogram, summarize } from "@/lib/stats";
import { batchCellsQuery } from "@/lib/validations/notebook";
import { BatchCellTable } from "./_components/batch-cell-table";
import { SerialImport } from "./_components/serial-import";

type Params = { params: Promise<{ batchId: string }> };

/** An id that is not a uuid cannot name a batch; checking first keeps it out of the query. */
const batchById = cache(async (batchId: string) => (z.uuid().safeParse(batchId).success ? getBatch(batchId) : null));
const loadBatch = async (params: Params["params"]) => batchById((await params).batchId);

/** The cells an overlay opens with: the lowest, the middle and the highest delivered capacity, the spread a QA lead looks at first. */
function spreadOf(rows: BatchCellRow[]): string[] {
  const tested = rows.filter((r) => r.deliveredMah !== null && r.deliveredRunId).sort((a, b) => (a.deliveredMah ?? 0) - (b.deliveredMah ?? 0));
  const picks = [tested[0], tested[Math.floor((tested.length - 1) / 2)], tested[tested.length - 1]];
  return [...new Set(picks.flatMap((r) => (r?.deliveredRunId ? [r.deliveredRunId] : [])))];
}

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const batch = await loadBatch(params);
  return { title: batch ? `Batch ${batch.lotCode}` : "Batch" };
}

export default async function BatchPage({ params }: Params) {
  const [batch, user] = await Promise.all([loadBatch(params), currentUser()]);
  if (!batch) notFound();
  const missing = batch.quantity - batch.registeredCells;
  const cells = (await getBatchCellRows(batch.id))?.rows ?? [];
  const firstPage = pageOfCellRows(cells, batchCellsQuery.parse({ pageSize: 25 }));
  const capacities = cells.flatMap((r) => (r.deliveredMah !== null ? [r.deliveredMah] : []));
  const spec = { lsl: batch.capacityLslMah, usl: batch.capacityUslMah };
  const hist = histogram(capacities, { spec });
  const stats = summarize(capacities);
  const belowLsl = capacities.filter((c) => c < batch.capacityLslMah).length;
  const aboveUsl = batch.capacityUslMah === null ? 0 : capacities.filter((c) => c > (batch.capacityUslMah as number)).length;
  const options = cells.flatMap((r) => (r.deliveredRunId ? [{ runId: r.deliveredRunId, label: `${r.serial} · ${formatMah(r.deliveredMah)}` }] : []));
  const initial = spreadOf(cells);
  const prefetched = (await Promise.all(initial.map((id) => getDischargeCurvePayload(id)))).filter((p) => p !== null);
  const mayImport = Boolean(user && can(user.role, "cell.import"));

  return (
    <>
      <PageTitle
        kicker={
          <Link href="/batches" className="hover:underline">
            Batch
          </Link>
        }
        title={<span className="font-mono">{batch.lotCode}</span>}
        actions={
          <>
            <Badge tone={dispositionTone[batch.disposition]}>Decision: {batch.disposition}</Badge>
            <Link href={batchQualityHref(batch.id)} className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Quality figures and decision
            </Link>
            <Link href={batchReportHref(batch.id)} className="no-print rounded-md border border-rule-strong bg-sheet px-3 py-1.5 text-sm font-medium hover:bg-paper">
              Printable lot report
            </Link>
          </>
        }
      />
      <div className="space-y-6">
        <Panel>
          <Facts
            items={[
              { label: "Cell type", value: batch.cellTypeName },
              { label: "Supplier", value: batch.supplier },
              { label: "Received", value: batch.receivedOn },
              { label: "Cells registered / ordered", value: `${batch.registeredCells} / ${batch.quantity}` },
              { label: "Capacity spec", value: formatCapacitySpec(batch.capacityLslMah, batch.capacityUslMah) },
              { label: "Decision", value: batch.disposition },
              { label: "Cells with a delivered capacity", value: `${capacities.length} of ${cells.length}` },
              {
                label: "Latest delivered capacity",
                value: stats ? `mean ${formatMah(stats.mean)}, from ${formatMah(stats.min)} to ${formatMah(stats.max)}` : "no cell tested yet",
              },
              {
                label: "Outside the spec",
                value: capacities.length ? `${belowLsl} below ${batch.capacityLslMah} mAh${batch.capacityUslMah !== null ? `, ${aboveUsl} above ${batch.capacityUslMah} mAh` : ""}` : "—",
              },
            ]}
          />
        </Panel>
        <section aria-labelledby="batch-cells-title">
          <h2 id="batch-cells-title" className="mb-3 text-base font-semibold">
            Cells of this batch
          </h2>
          <Suspense>
            <BatchCellTable
              batchId={batch.id}
              lotCode={batch.lotCode}
              initial={firstPage}
              empty={
                mayImport
                  ? "No cells registered yet. Import the serial list that came with the lot, below."
                  : "No cells registered yet. A technician imports the lot's serial list on this page."
              }
            />
          </Suspense>
        </section>
        {mayImport ? (
          // Open while cells are missing; afterwards it stays out of the way of the figures.
          <details open={missing > 0} className="no-print group">
            <summary className="cursor-pointer text-sm font-semibold text-copper-dark">
              {missing > 0 ? `Import the serial list (${missing} of ${batch.quantity} cells not registered)` : "Import more serials"}
            </summary>
            <div className="mt-3 max-w-xl">
              <SerialImport batchId={batch.id} lotCode={batch.lotCode} expected={missing > 0 ? missing : 0} />
            </div>
          </details>
        ) : null}
        <div className="space-y-6">
          <Panel title="Capacity distribution">
            {hist ? (
              <CapacityHistogramChart bars={histogramBars(hist)} />
            ) : (
              <p className="text-sm text-ink-soft">No cell of this batch has a delivered capacity yet: upload the incoming capacity checks on the Upload page.</p>
            )}
          </Panel>
          <Panel title="Discharge curves of chosen cells">
            <CurveOverlay options={options} initial={initial} prefetched={prefetched} title={`Voltage against delivered capacity, batch ${batch.lotCode}`} />
          </Panel>
        </div>
      </div>
    </>
  );
}
