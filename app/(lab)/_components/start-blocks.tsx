import Link from "next/link";
import type { ReactNode } from "react";
import { Badge, cellStatusTone } from "@/components/ui/badge";
import { buttonClass } from "@/components/ui/button";
import { Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { isRole, roleLabels, roles } from "@/lib/auth/roles";
import { countUsersByRole, listCellTypeCellCounts, listPendingBatches, listRecentCellsBy } from "@/lib/db/queries/overview";
import { batchHref, cellHref } from "@/lib/registry/links";

export const linkClass = "text-copper-dark underline-offset-2 hover:underline";

export function Empty({ children }: { children: ReactNode }) {
  return <div className="rounded-md border border-dashed border-rule-strong bg-paper px-4 py-5 text-sm text-ink-soft">{children}</div>;
}

/** Technician: what they registered lately, and the way to register more. */
export async function RecentCellsBlock({ userId }: { userId: string }) {
  const cells = await listRecentCellsBy(userId);
  return (
    <Panel
      title="Cells you registered lately"
      actions={
        <Link href="/cells#register-cell" className={buttonClass("primary")}>
          Register a cell
        </Link>
      }
    >
      {cells.length === 0 ? (
        <Empty>
          You have not registered any cells yet. Register a single cell on the{" "}
          <Link href="/cells#register-cell" className={linkClass}>
            Cells
          </Link>{" "}
          page, or open a lot on{" "}
          <Link href="/batches" className={linkClass}>
            Batches
          </Link>{" "}
          and import the serial list that came with it.
        </Empty>
      ) : (
        <SimpleTable caption="Cells you registered lately" headers={headersOf("Serial", "Status", "Batch", "Cell type")}>
          {cells.map((c) => (
            <tr key={c.serial}>
              <td className={cellClass()}>
                <Link href={cellHref(c.serial)} className={`font-mono ${linkClass}`}>
                  {c.serial}
                </Link>
              </td>
              <td className={cellClass()}>
                <Badge tone={cellStatusTone[c.status]}>{c.status}</Badge>
              </td>
              <td className={cellClass()}>
                {c.batchId ? (
                  <Link href={batchHref(c.batchId)} className={linkClass}>
                    {c.lotCode}
                  </Link>
                ) : (
                  <span className="text-ink-soft">none</span>
                )}
              </td>
              <td className={cellClass()}>{c.cellTypeName}</td>
            </tr>
          ))}
        </SimpleTable>
      )}
    </Panel>
  );
}

/** QA lead: lots still waiting for a decision, the longest waiting first. */
export async function PendingBatchesBlock() {
  const { items, total } = await listPendingBatches();
  return (
    <Panel
      title={`Batches waiting for a decision${total ? ` (${total})` : ""}`}
      actions={
        <Link href="/batches?disposition=pending" className={buttonClass()}>
          All pending batches
        </Link>
      }
    >
      {items.length === 0 ? (
        <Empty>
          No batch is waiting for a decision. When a lot arrives, register it on{" "}
          <Link href="/batches" className={linkClass}>
            Batches
          </Link>
          ; it waits here until its cells are tested and you decide.
        </Empty>
      ) : (
        <SimpleTable
          caption="Batches waiting for a decision"
          headers={headersOf("Lot", "Cell type", "Received", "Cells registered / ordered#")}
        >
          {items.map((b) => (
            <tr key={b.id}>
              <td className={cellClass()}>
                <Link href={batchHref(b.id)} className={`font-mono ${linkClass}`}>
                  {b.lotCode}
                </Link>
              </td>
              <td className={cellClass()}>{b.cellTypeName}</td>
              <td className={`${cellClass()} tabular-nums`}>{b.receivedOn}</td>
              <td className={cellClass(true)}>
                {b.registeredCells} / {b.quantity}
              </td>
            </tr>
          ))}
        </SimpleTable>
      )}
      {total > items.length ? <p className="mt-2 text-xs text-ink-soft">Showing the {items.length} that have waited longest.</p> : null}
    </Panel>
  );
}

/** Engineer: the cell types and how many of their cells are in use, flagged or retired. */
export async function CellTypeCountsBlock() {
  const types = await listCellTypeCellCounts();
  return (
    <Panel
      title="Cell types and their cells"
      actions={
        <Link href="/cell-types" className={buttonClass()}>
          Cell types
        </Link>
      }
    >
      {types.length === 0 ? (
        <Empty>
          No cell types yet. Add the first on{" "}
          <Link href="/cell-types" className={linkClass}>
            Cell types
          </Link>
          : start from a chemistry preset, then check each value against the cell maker&apos;s data sheet.
        </Empty>
      ) : (
        <SimpleTable
          caption="Cell types and their cells"
          headers={headersOf("Cell type", "Chemistry", "Rated mAh#", "Active#", "Flagged#", "Retired#")}
        >
          {types.map((t) => (
            <tr key={t.id}>
              <td className={cellClass()}>{t.name}</td>
              <td className={cellClass()}>{t.chemistry}</td>
              <td className={cellClass(true)}>{t.ratedCapacityMah}</td>
              <td className={cellClass(true)}>{t.active}</td>
              <td className={`${cellClass(true)} ${t.flagged ? "font-semibold text-warn" : ""}`}>{t.flagged}</td>
              <td className={cellClass(true)}>{t.retired}</td>
            </tr>
          ))}
        </SimpleTable>
      )}
    </Panel>
  );
}

/** Administrator: who holds which role, and the way to People. */
export async function UserCountsBlock() {
  const counts = await countUsersByRole();
  const byRole = new Map(counts.map((c) => [c.role, c.users]));
  const total = counts.reduce((sum, c) => sum + c.users, 0);
  const unknown = counts.filter((c) => !isRole(c.role));
  return (
    <Panel
      title="Accounts by role"
      actions={
        <Link href="/admin/users" className={buttonClass("primary")}>
          People
        </Link>
      }
    >
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        {roles.map((role) => (
          <div key={role} className="rounded-md border border-rule bg-paper px-3 py-2">
            <dt className="text-xs font-semibold uppercase tracking-wide text-ink-soft">{roleLabels[role]}</dt>
            <dd className="text-2xl font-semibold tabular-nums">{byRole.get(role) ?? 0}</dd>
          </div>
        ))}
      </dl>
      {unknown.length ? (
        <p className="mt-3 text-sm text-warn">
          {unknown.map((u) => `${u.users} with the unknown role “${u.role}”`).join(", ")}: they cannot sign in until given a role on People.
        </p>
      ) : null}
      {total <= 1 ? (
        <div className="mt-4">
          <Empty>
            Only your own account exists so far. Create accounts for your colleagues on{" "}
            <Link href="/admin/users" className={linkClass}>
              People
            </Link>
            , each with the role that fits their work.
          </Empty>
        </div>
      ) : null}
    </Panel>
  );
}
