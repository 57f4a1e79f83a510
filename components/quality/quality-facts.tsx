import Link from "next/link";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Facts } from "@/components/ui/facts";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import type { BatchQuality } from "@/lib/db/queries/quality";
import { cellHealthHref } from "@/lib/flags/links";
import { formatMah, formatMilliohm, formatNumber } from "@/lib/notebook/format";
import { formatCapacitySpec } from "@/lib/registry/format";
import type { CapabilityVerdict } from "@/lib/stats";

const verdictTone: Record<CapabilityVerdict, BadgeTone> = { capable: "good", marginal: "warn", "not capable": "bad" };

export function CapabilityFacts({ q }: { q: BatchQuality }) {
  const s = q.report.summary;
  const c = q.report.capability;
  const below = q.report.cells.filter((x) => x.belowLsl).length;
  const above = q.report.cells.filter((x) => x.aboveUsl).length;
  return (
    <>
      <Facts
        items={[
          { label: "Cells measured", value: `${s?.n ?? 0} of ${q.delivered.length + q.unmeasured.length}` },
          { label: "Mean delivered capacity", value: formatMah(s?.mean) },
          { label: "Standard deviation", value: formatMah(s?.sd) },
          { label: "Coefficient of variation", value: s?.cv_pct === null || s?.cv_pct === undefined ? "—" : `${formatNumber(s.cv_pct, 2)} %` },
          { label: "Lowest / highest", value: `${formatMah(s?.min)} / ${formatMah(s?.max)}` },
          { label: "Capacity spec", value: formatCapacitySpec(q.batch.capacityLslMah, q.batch.capacityUslMah) },
          { label: "Outside the spec", value: `${below} below${q.batch.capacityUslMah !== null ? `, ${above} above` : ""}` },
          {
            label: c ? `Capability (${c.index})` : "Capability",
            value: c ? (
              <span className="flex items-center gap-2">
                <span className="font-semibold tabular-nums">{formatNumber(c.value, 2)}</span>
                <Badge tone={verdictTone[c.verdict]}>{c.verdict}</Badge>
              </span>
            ) : (
              "Needs at least two measured cells with some spread"
            ),
          },
          ...(c && c.cp !== null ? [{ label: "Cp / Cpk", value: `${formatNumber(c.cp, 2)} / ${formatNumber(c.cpk, 2)}` }] : []),
          ...(c ? [{ label: "Cpl / Cpu", value: `${formatNumber(c.cpl, 2)} / ${formatNumber(c.cpu, 2)}` }] : []),
        ]}
      />
      <p className="mt-3 text-xs text-ink-soft">
        NIST/SEMATECH e-Handbook §6.1.6: Cpl = (mean − LSL)/(3s), Cpu = (USL − mean)/(3s), Cp = (USL − LSL)/(6s), Cpk = min(Cpl, Cpu), with s the sample standard deviation of the batch. Below 1 not capable, 1 to 1.33 marginal, 1.33 and above capable. Delivered capacity is each cell&apos;s first capacity measurement.
      </p>
    </>
  );
}

export function OutlierFacts({ q }: { q: BatchQuality }) {
  const f = q.report.fences;
  const g = q.report.grubbs;
  return (
    <div className="space-y-3 text-sm">
      {f ? (
        <p>
          Tukey fences (e-Handbook §7.1.6): Q1 {formatMah(f.q1)}, Q3 {formatMah(f.q3)}, IQR {formatMah(f.iqr)}; mild outliers outside {formatMah(f.lowerInner)} to {formatMah(f.upperInner)}, extreme outside {formatMah(f.lowerOuter)} to {formatMah(f.upperOuter)}.
        </p>
      ) : (
        <p className="text-ink-soft">No measured cells.</p>
      )}
      {g && g.steps.length ? (
        <SimpleTable caption="Grubbs test steps" headers={headersOf("Step#", "n#", "Suspect", "G#", "Critical#", "Outcome")}>
          {g.steps.map((step, i) => (
            <tr key={i}>
              <td className={cellClass(true)}>{i + 1}</td>
              <td className={cellClass(true)}>{step.n}</td>
              <td className={cellClass()}>{formatMah(step.suspectValue)}</td>
              <td className={cellClass(true)}>{formatNumber(step.g, 3)}</td>
              <td className={cellClass(true)}>{formatNumber(step.critical, 3)}</td>
              <td className={cellClass()}>{step.rejected ? "outlier" : "no outlier"}</td>
            </tr>
          ))}
        </SimpleTable>
      ) : (
        <p className="text-ink-soft">The Grubbs test needs at least 3 measured cells with some spread.</p>
      )}
      <p className="text-xs text-ink-soft">Grubbs (e-Handbook §1.3.5.17), two-sided at α = {g?.alpha ?? 0.05}, repeated after each outlier up to {g?.maxOutliers ?? 3}; it assumes normal data, and the handbook advises against it for 6 or fewer values.</p>
    </div>
  );
}

/** Each cell of the lot with its delivered capacity and where it falls against the spec and the outlier tests, then the cells not measured yet. */
export function QualityCellTable({ q }: { q: BatchQuality }) {
  const byName = new Map(q.delivered.map((d) => [d.serial, d]));
  return (
    <>
      <SimpleTable caption={`Cells of batch ${q.batch.lotCode} with their delivered capacity`} headers={headersOf("Cell", "Status", "Capacity#", "z#", "Tukey", "Grubbs", "Spec", "Fade per 100 cycles#", "DCIR#")}>
        {q.report.cells.map((c) => {
          const d = byName.get(c.serial);
          return (
            <tr key={c.serial}>
              <td className={cellClass()}>
                <Link href={cellHealthHref(c.serial)} className="whitespace-nowrap font-mono text-copper-dark underline-offset-2 hover:underline">
                  {c.serial}
                </Link>
              </td>
              <td className={cellClass()}>{d?.status ?? "—"}</td>
              <td className={cellClass(true)}>{formatMah(c.capacity_mAh)}</td>
              <td className={cellClass(true)}>{formatNumber(c.z, 2)}</td>
              <td className={cellClass()}>{c.fence ?? "—"}</td>
              <td className={cellClass()}>{c.grubbsOutlier ? "outlier" : ""}</td>
              <td className={cellClass()}>{c.belowLsl ? "below" : c.aboveUsl ? "above" : "within"}</td>
              <td className={cellClass(true)}>{d?.fadePer100Cycles_pctRated === null || d?.fadePer100Cycles_pctRated === undefined ? "—" : `${formatNumber(d.fadePer100Cycles_pctRated, 2)} %`}</td>
              <td className={cellClass(true)}>{formatMilliohm(d?.dcir_mOhm)}</td>
            </tr>
          );
        })}
      </SimpleTable>
      {q.unmeasured.length ? (
        <p className="mt-3 text-sm text-ink-soft">
          Not measured yet: <span className="font-mono">{q.unmeasured.map((u) => u.serial).join(", ")}</span>
        </p>
      ) : null}
    </>
  );
}
