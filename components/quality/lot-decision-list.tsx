import { SignatureLine } from "@/components/signature/signature-line";
import type { LotDecisionView } from "@/lib/db/queries/quality";
import { formatDateTime, formatMah, formatNumber } from "@/lib/notebook/format";

/** A lot's decisions, newest first: the step, who and when, why, the signature and the figures in view. */
export function LotDecisionList({ decisions, formatWhen = formatDateTime }: { decisions: readonly LotDecisionView[]; formatWhen?: (at: Date) => string }) {
  if (!decisions.length) return <p className="text-sm text-ink-soft">No decision yet: the lot is pending.</p>;
  return (
    <ol className="space-y-3 text-sm">
      {decisions.map((d) => (
        <li key={d.id}>
          <span className="font-semibold">
            {d.fromDisposition} → {d.disposition}
          </span>{" "}
          by {d.decidedByName}, {formatWhen(d.decidedAt)}
          <span className="block">{d.reason}</span>
          <SignatureLine signature={d.signature} />
          {d.figures ? (
            <span className="block text-xs text-ink-soft">
              In view: n = {d.figures.n}, mean {formatMah(d.figures.mean_mAh)}
              {d.figures.capability ? `, ${d.figures.capability.index} ${formatNumber(d.figures.capability.value, 2)} (${d.figures.capability.verdict})` : ""}
              {`, ${d.figures.unclosedFlags} flag${d.figures.unclosedFlags === 1 ? "" : "s"} not closed`}
            </span>
          ) : null}
        </li>
      ))}
    </ol>
  );
}
