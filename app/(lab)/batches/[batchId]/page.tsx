import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache, Suspense } from "react";
import { z } from "zod";
import { CellTable } from "@/components/cell-table";
import { Badge, dispositionTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { PageTitle, Panel } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { getBatch } from "@/lib/db/queries/registry";
import { formatCapacitySpec } from "@/lib/registry/format";
import { SerialImport } from "./_components/serial-import";

type Params = { params: Promise<{ batchId: string }> };

/** An id that is not a uuid cannot name a batch; checking first keeps it out of the query. */
const batchById = cache(async (batchId: string) => (z.uuid().safeParse(batchId).success ? getBatch(batchId) : null));
const loadBatch = async (params: Params["params"]) => batchById((await params).batchId);

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const batch = await loadBatch(params);
  return { title: batch ? `Batch ${batch.lotCode}` : "Batch" };
}

export default async function BatchPage({ params }: Params) {
  const [batch, user] = await Promise.all([loadBatch(params), currentUser()]);
  if (!batch) notFound();
  const missing = batch.quantity - batch.registeredCells;

  return (
    <>
      <PageTitle
        kicker={
          <Link href="/batches" className="hover:underline">
            Batch
          </Link>
        }
        title={<span className="font-mono">{batch.lotCode}</span>}
        actions={<Badge tone={dispositionTone[batch.disposition]}>Decision: {batch.disposition}</Badge>}
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
            ]}
          />
        </Panel>
        <div className="grid gap-6 lg:grid-cols-[1fr_26rem]">
          <section aria-labelledby="batch-cells-title">
            <h2 id="batch-cells-title" className="mb-3 text-base font-semibold">
              Cells of this batch
            </h2>
            <Suspense>
              <CellTable
                batchId={batch.id}
                caption={`Cells of batch ${batch.lotCode}`}
                empty={
                  user && can(user.role, "cell.import")
                    ? "No cells registered yet. Import the serial list that came with the lot."
                    : "No cells registered yet."
                }
              />
            </Suspense>
          </section>
          {user && can(user.role, "cell.import") ? (
            <SerialImport batchId={batch.id} lotCode={batch.lotCode} expected={missing > 0 ? missing : 0} />
          ) : null}
        </div>
      </div>
    </>
  );
}
