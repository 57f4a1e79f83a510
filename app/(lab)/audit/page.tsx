import type { Metadata } from "next";
import { forbidden } from "next/navigation";
import { Suspense } from "react";
import { PageTitle } from "@/components/ui/panel";
import { can } from "@/lib/auth/roles";
import { currentUser } from "@/lib/auth/session";
import { auditFilterOptions } from "@/lib/db/queries/audit";
import { AuditTable } from "./_components/audit-table";

export const metadata: Metadata = { title: "Audit trail" };

export default async function AuditPage() {
  const user = await currentUser();
  // The layout sends signed-out visitors to sign-in; a role without the capability gets a real 403.
  if (!user || !can(user.role, "audit.read")) forbidden();
  const options = await auditFilterOptions();
  return (
    <>
      <PageTitle kicker="Records" title="Audit trail" />
      <p className="mb-4 max-w-3xl text-sm text-ink-soft">
        Every change to cells, batches, cell types, runs, people and settings, with who made it, when, and the values before and after. Events
        are only ever added: the database refuses to change or remove one. Times are shown in your browser&apos;s time zone. To follow one cell from
        its registration to its retirement, search for its serial: its own events, and those of its runs and flags, are listed. Each cell&apos;s printable
        report ends with the same history.
      </p>
      <Suspense>
        <AuditTable options={options} />
      </Suspense>
    </>
  );
}
