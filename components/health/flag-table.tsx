import Link from "next/link";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { FlagListItem } from "@/lib/db/queries/flags";
import { batchQualityHref, cellHealthHref, flagHref } from "@/lib/flags/links";
import { kindTitle } from "@/lib/flags/vocabulary";
import { formatDateTime } from "@/lib/notebook/format";
import { FlagStateBadge } from "./flag-badges";

/** Flags as a small table: state, cell, what, when; each row links to the flag's page. */
export function FlagTable({ flags, caption, showCell = true }: { flags: readonly FlagListItem[]; caption: string; showCell?: boolean }) {
  const headers = headersOf("State", ...(showCell ? ["Cell"] : []), "What", "Finding", "Opened");
  return (
    <SimpleTable caption={caption} headers={headers} boxed>
      {flags.map((f) => (
        <tr key={f.id}>
          <td className={cellClass()}>
            <FlagStateBadge state={f.state} />
          </td>
          {showCell ? (
            <td className={cellClass()}>
              <Link href={cellHealthHref(f.serial)} className="font-mono text-copper-dark underline-offset-2 hover:underline">
                {f.serial}
              </Link>
              {f.lotCode && f.batchId ? (
                <Link href={batchQualityHref(f.batchId)} className="block text-xs text-ink-soft underline-offset-2 hover:underline">
                  {f.lotCode}
                </Link>
              ) : null}
            </td>
          ) : null}
          <td className={cellClass()}>
            <Link href={flagHref(f.id)} className="text-copper-dark underline-offset-2 hover:underline">
              {kindTitle(f.kind)}
            </Link>
          </td>
          <td className={`${cellClass()} max-w-md`}>{f.summary}</td>
          <td className={`${cellClass()} whitespace-nowrap`}>{formatDateTime(f.createdAt)}</td>
        </tr>
      ))}
    </SimpleTable>
  );
}
