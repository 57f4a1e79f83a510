import { SafetyCautions } from "@/components/safety-cautions";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Panel } from "@/components/ui/panel";
import type { RunFindingView } from "@/lib/db/queries/run-views";
import { formatClock, formatNumber } from "@/lib/notebook/format";

const severityTone: Record<string, BadgeTone> = { danger: "bad", warning: "warn", info: "neutral" };

function where(f: RunFindingView): string {
  const span = f.endS !== null && f.endS > f.timeS ? `from ${formatClock(f.timeS)} to ${formatClock(f.endS)}` : `at ${formatClock(f.timeS)}`;
  return `${span}${f.line !== null ? `, line ${f.line} of the file` : ""}`;
}

function measured(f: RunFindingView): string | null {
  if (f.value === null) return null;
  const unit = f.unit ? ` ${f.unit}` : "";
  const decimals = f.unit === "V" || f.unit === "A" ? 3 : 1;
  return `${formatNumber(f.value, decimals)}${unit}${f.limitValue !== null ? ` against a limit of ${formatNumber(f.limitValue, decimals)}${unit}` : ""}`;
}

function FindingItem({ f }: { f: RunFindingView }) {
  const value = measured(f);
  return (
    <li className="py-2">
      <p className="flex flex-wrap items-center gap-2">
        <Badge tone={severityTone[f.severity] ?? "neutral"}>{f.severity}</Badge>
        <span className="font-medium">{f.message}</span>
      </p>
      <p className="mt-0.5 text-xs text-ink-soft">
        {where(f)}
        {value ? ` · ${value}` : ""}
      </p>
      {f.caution ? <p className="mt-1 text-sm text-ink">{f.caution}</p> : null}
    </li>
  );
}

/**
 * Safety findings first and prominent: each with the engine's caution, then the lab's general
 * cautions, which defer to local codes, the cell maker's data sheet and the lab's procedures.
 */
export function SafetyFindings({ findings }: { findings: RunFindingView[] }) {
  if (findings.length === 0) return null;
  return (
    <section aria-labelledby="safety-findings-title" className="rounded-lg border-2 border-danger bg-danger-wash/60 p-5">
      <h2 id="safety-findings-title" className="text-base font-semibold text-danger">
        {findings.length === 1 ? "1 safety finding" : `${findings.length} safety findings`} in this run
      </h2>
      <p className="mt-1 text-sm text-ink">
        The log shows conditions outside the cell type&apos;s limits. Check the cell before it is used or tested again. Kneepoint reads the log after the fact; it does not
        protect anyone at the bench.
      </p>
      <ul className="mt-2 divide-y divide-danger/20">
        {findings.map((f, i) => (
          <FindingItem key={`${f.kind}-${f.timeS}-${i}`} f={f} />
        ))}
      </ul>
      <div className="mt-3">
        <SafetyCautions />
      </div>
    </section>
  );
}

/** Everything else the analysis noticed: data quality (gaps, skipped rows) and charge endings. */
export function OtherFindings({ findings }: { findings: RunFindingView[] }) {
  return (
    <Panel title="Other findings">
      {findings.length === 0 ? (
        <p className="text-sm text-ink-soft">Nothing else to report: no logging gaps, skipped rows or unfinished charges.</p>
      ) : (
        <ul className="divide-y divide-rule text-sm">
          {findings.map((f, i) => (
            <FindingItem key={`${f.kind}-${f.timeS}-${i}`} f={f} />
          ))}
        </ul>
      )}
    </Panel>
  );
}
