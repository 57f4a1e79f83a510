import type { Metadata } from "next";
import { Suspense } from "react";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listCellTypes } from "@/lib/db/queries/registry";
import { BatchTable } from "./_components/batch-table";
import { NewBatchForm } from "./_components/new-batch-form";

export const metadata: Metadata = { title: "Batches" };

export default async function BatchesPage() {
  const user = await currentUser();
  const cellTypes = (await listCellTypes()).map(({ id, name, ratedCapacityMah }) => ({ id, name, ratedCapacityMah }));
  return (
    <>
      <PageTitle kicker="Registry" title="Batches" />
      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <Suspense>
          <BatchTable cellTypes={cellTypes} />
        </Suspense>
        {user && can(user.role, "batch.write") ? <NewBatchForm cellTypes={cellTypes} /> : null}
      </div>
    </>
  );
}
