import type { Metadata } from "next";
import { Suspense } from "react";
import { CellTable } from "@/components/cell-table";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listBatchOptions, listCellTypes } from "@/lib/db/queries/registry";
import { NewCellForm } from "./_components/new-cell-form";

export const metadata: Metadata = { title: "Cells" };

export default async function CellsPage() {
  const user = await currentUser();
  const [batches, cellTypes] = await Promise.all([listBatchOptions(), listCellTypes()]);
  const typeNames = cellTypes.map(({ id, name }) => ({ id, name }));
  return (
    <>
      <PageTitle kicker="Registry" title="Cells" />
      <div className="grid gap-6 lg:grid-cols-[1fr_22rem]">
        <Suspense>
          <CellTable
            caption="Cells"
            batches={batches}
            empty="No cells yet. Register one with the form beside this table, or import a batch's serial list from its batch page."
          />
        </Suspense>
        {user && can(user.role, "cell.write") ? <NewCellForm batches={batches} cellTypes={typeNames} /> : null}
      </div>
    </>
  );
}
