import type { Metadata } from "next";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listCellTypes } from "@/lib/db/queries/registry";
import { CellTypeTable } from "./_components/cell-type-table";
import { NewCellTypeForm } from "./_components/new-cell-type-form";

export const metadata: Metadata = { title: "Cell types" };

export default async function CellTypesPage() {
  const [user, cellTypes] = await Promise.all([currentUser(), listCellTypes()]);
  const mayWrite = Boolean(user && can(user.role, "cell-type.write"));
  return (
    <>
      <PageTitle kicker="Registry" title="Cell types" />
      <div className="space-y-6">
        <CellTypeTable
          cellTypes={cellTypes}
          emptyHint={
            mayWrite
              ? "No cell types yet. Add the first one below, starting from a chemistry preset and the cell maker's data sheet."
              : "No cell types yet. An engineer or administrator adds them; batches and cells need one."
          }
        />
        {mayWrite ? <NewCellTypeForm /> : null}
      </div>
    </>
  );
}
