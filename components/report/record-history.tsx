import Link from "next/link";
import { AuditDiff } from "@/components/audit/audit-diff";
import { headersOf } from "@/components/ui/simple-table";
import type { AuditEventView } from "@/lib/db/queries/audit";
import { formatUtc } from "@/lib/notebook/format";

const cell = "border-b border-rule/60 px-2 py-1.5";

/** Audit events in the order they happened, every recorded value shown, for a printed record. */
export function RecordHistory({ events, caption, truncated, auditHref }: { events: readonly AuditEventView[]; caption: string; truncated: boolean; auditHref: string }) {
  return (
    <div className="space-y-2">
      {/* Fixed columns: long ids and hashes wrap inside their cell instead of pushing the table off the page. */}
      <table className="w-full table-fixed text-sm">
        <caption className="sr-only">{caption}</caption>
        <colgroup>
          <col className="w-[7.5rem]" />
          <col className="w-[6.5rem]" />
          <col className="w-[5.5rem]" />
          <col className="w-[9rem]" />
          <col />
        </colgroup>
        <thead className="text-left text-xs uppercase tracking-wide text-ink-soft">
          <tr>
            {headersOf("When", "Who", "Action", "Record", "Before → after").map((h) => (
              <th key={h.key} scope="col" className="border-b border-rule px-2 py-2 font-semibold">
                {h.label}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {events.map((e) => (
            <tr key={e.id} className="align-top [overflow-wrap:anywhere]">
              <td className={`${cell} tabular-nums`}>
                <time dateTime={e.at}>{formatUtc(e.at)}</time>
              </td>
              <td className={cell}>{e.actorName ?? "system"}</td>
              <td className={cell}>{e.action}</td>
              <td className={cell}>
                <span className="text-ink-soft">{e.entity}</span>{" "}
                {e.entityHref ? (
                  <Link href={e.entityHref} className="text-copper-dark underline-offset-2 hover:underline">
                    {e.entityLabel ?? e.entityId}
                  </Link>
                ) : (
                  (e.entityLabel ?? e.entityId)
                )}
              </td>
              <td className={`${cell} text-xs`}>
                <AuditDiff before={e.before} after={e.after} expanded />
              </td>
            </tr>
          ))}
        </tbody>
      </table>
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
