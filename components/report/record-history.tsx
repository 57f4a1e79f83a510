import Link from "next/link";
import { AuditDiff } from "@/components/audit/audit-diff";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { AuditEventView } from "@/lib/db/queries/audit";
import { formatUtc } from "@/lib/notebook/format";

/** Audit events in the order they happened, every recorded value shown, for a printed record. */
export function RecordHistory({ events, caption, truncated, auditHref }: { events: readonly AuditEventView[]; caption: string; truncated: boolean; auditHref: string }) {
  return (
    <div className="space-y-2">
      <SimpleTable caption={caption} headers={headersOf("When", "Who", "Action", "Record", "Before → after")}>
        {events.map((e) => (
          <tr key={e.id} className="align-top">
            <td className={`${cellClass()} whitespace-nowrap tabular-nums`}>
              <time dateTime={e.at}>{formatUtc(e.at)}</time>
            </td>
            <td className={cellClass()}>{e.actorName ?? "system"}</td>
            <td className={cellClass()}>{e.action}</td>
            <td className={cellClass()}>
              <span className="text-ink-soft">{e.entity}</span>{" "}
              {e.entityHref ? (
                <Link href={e.entityHref} className="text-copper-dark underline-offset-2 hover:underline">
                  {e.entityLabel ?? e.entityId}
                </Link>
              ) : (
                (e.entityLabel ?? e.entityId)
              )}
            </td>
            <td className={`${cellClass()} text-xs`}>
              <AuditDiff before={e.before} after={e.after} expanded />
            </td>
          </tr>
        ))}
      </SimpleTable>
      <p className="text-xs text-ink-soft">
        {truncated ? `Only the first ${events.length} events are printed here. ` : ""}
        The same events, with filters, are on the{" "}
        <Link href={auditHref} className="text-copper-dark underline-offset-2 hover:underline">
          audit trail
        </Link>
        .
      </p>
    </div>
  );
}
