import type { Metadata } from "next";
import { forbidden } from "next/navigation";
import { SafetyCautions } from "@/components/safety-cautions";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { listColumnMaps } from "@/lib/db/queries/column-maps";
import { listBatchOptions } from "@/lib/db/queries/registry";
import { UploadWorkbench } from "./_components/upload-workbench";

export const metadata: Metadata = { title: "Upload logs" };

export default async function UploadPage() {
  const user = await currentUser();
  // A role without the capability gets a real 403 and the not-allowed page, not a 200.
  if (!user || !can(user.role, "run.upload")) forbidden();
  const batches = (await listBatchOptions()).map(({ id, lotCode }) => ({ id, lotCode }));
  const savedMaps = (await listColumnMaps(user.id)).map(({ id, name, ownerName, map }) => ({ id, name, ownerName, map }));
  return (
    <>
      <PageTitle kicker="Bench" title="Upload bench logs" />
      <div className="grid gap-6 xl:grid-cols-[1fr_20rem]">
        <UploadWorkbench canCreateCell={can(user.role, "cell.write")} batches={batches} savedMaps={savedMaps} />
        <div className="space-y-4">
          <SafetyCautions />
          <p className="text-sm text-ink-soft">
            The raw file is stored untouched with its SHA-256. The same file uploaded twice for one cell is refused and points to the run already stored.
          </p>
        </div>
      </div>
    </>
  );
}
