import { SignatureLine } from "@/components/signature/signature-line";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { FlagTransitionView } from "@/lib/db/queries/flags";
import { formatDateTime } from "@/lib/notebook/format";

/** Every step of one flag, oldest first, with the signature on the step that cleared it. */
export function FlagHistoryTable({ transitions, caption, formatWhen = formatDateTime }: { transitions: readonly FlagTransitionView[]; caption: string; formatWhen?: (at: Date) => string }) {
  return (
    <SimpleTable caption={caption} headers={headersOf("When", "Step", "Who", "Why")} boxed>
      {transitions.map((t) => (
        <tr key={t.id}>
          <td className={`${cellClass()} whitespace-nowrap`}>{formatWhen(t.at)}</td>
          <td className={cellClass()}>{t.fromState ? `${t.fromState} → ${t.toState}` : "opened"}</td>
          <td className={cellClass()}>{t.actorName}</td>
          <td className={cellClass()}>
            {t.reason}
            <SignatureLine signature={t.signature} className="mt-1 block text-xs text-ink-soft" />
          </td>
        </tr>
      ))}
    </SimpleTable>
  );
}
