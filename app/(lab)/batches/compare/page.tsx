import type { Metadata } from "next";
import Link from "next/link";
import { MeanIntervals } from "@/components/health/mean-intervals";
import { buttonClass } from "@/components/ui/button";
import { PageTitle, Panel } from "@/components/ui/panel";
import { cellClass, headersOf, SimpleTable } from "@/components/ui/simple-table";
import { compareBatchQuality } from "@/lib/db/queries/quality";
import { listBatchOptions } from "@/lib/db/queries/registry";
import { batchQualityHref } from "@/lib/flags/links";
import { formatMah, formatNumber } from "@/lib/notebook/format";
import { compareQuery } from "@/lib/validations/flags";

export const metadata: Metadata = { title: "Compare batches" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function CompareBatchesPage({ searchParams }: Search) {
  const parsed = compareQuery.safeParse({ batch: (await searchParams).batch });
  const selected = parsed.success ? parsed.data.batch : [];
  const [options, compared] = await Promise.all([listBatchOptions(), compareBatchQuality(selected)]);
  const lotOf = new Map(compared.batches.map((b) => [b.id, b.lotCode]));
  const { comparison } = compared;
  const rows = comparison.batches.flatMap((b) => (b.mean ? [{ label: lotOf.get(b.id) ?? b.id, mean: b.mean.mean, low: b.mean.low, high: b.mean.high }] : []));

  return (
    <>
      <PageTitle
        kicker={
          <Link href="/batches" className="hover:underline">
            Batches
          </Link>
        }
        title="Compare batches"
      />
      <div className="space-y-6">
        <Panel title="Batches to compare">
          <form method="get" className="space-y-3">
            <div className="flex flex-wrap gap-x-5 gap-y-2">
              {options.map((b) => (
                <label key={b.id} className="flex items-center gap-2 text-sm">
                  <input type="checkbox" name="batch" value={b.id} defaultChecked={selected.includes(b.id)} />
                  <span className="font-mono">{b.lotCode}</span>
                </label>
              ))}
            </div>
            {!parsed.success ? (
              <p role="alert" className="text-sm text-danger">
                {parsed.error.issues[0]?.message ?? "Choose batches from the list."}
              </p>
            ) : null}
            <button type="submit" className={buttonClass("primary")}>
              Compare
            </button>
          </form>
        </Panel>
        {compared.batches.length < 2 ? (
          <p className="text-sm text-ink-soft">Choose two or more batches. Each cell counts with its delivered capacity, its first capacity measurement.</p>
        ) : (
          <>
            <Panel title="Delivered capacity by batch">
              <MeanIntervals rows={rows} unit="mAh" title={`Mean delivered capacity with ${comparison.confidence * 100} % confidence intervals`} />
              <div className="mt-4">
                <SimpleTable caption="Delivered capacity by batch" headers={headersOf("Batch", "Type", "Cells#", "Mean#", "95 % interval#", "SD#", "CV#", "Min#", "Q1#", "Median#", "Q3#", "Max#")}>
                  {compared.batches.map((b, i) => {
                    const c = comparison.batches[i];
                    const s = c?.summary;
                    return (
                      <tr key={b.id}>
                        <td className={cellClass()}>
                          <Link href={batchQualityHref(b.id)} className="font-mono text-copper-dark underline-offset-2 hover:underline">
                            {b.lotCode}
                          </Link>
                        </td>
                        <td className={cellClass()}>{b.cellTypeName}</td>
                        <td className={cellClass(true)}>{s?.n ?? 0}</td>
                        <td className={cellClass(true)}>{formatMah(s?.mean)}</td>
                        <td className={cellClass(true)}>{c?.mean ? `${formatNumber(c.mean.low, 1)} to ${formatNumber(c.mean.high, 1)}` : "—"}</td>
                        <td className={cellClass(true)}>{formatMah(s?.sd)}</td>
                        <td className={cellClass(true)}>{s?.cv_pct === null || s?.cv_pct === undefined ? "—" : `${formatNumber(s.cv_pct, 2)} %`}</td>
                        <td className={cellClass(true)}>{formatNumber(s?.min, 1)}</td>
                        <td className={cellClass(true)}>{formatNumber(s?.q1, 1)}</td>
                        <td className={cellClass(true)}>{formatNumber(s?.median, 1)}</td>
                        <td className={cellClass(true)}>{formatNumber(s?.q3, 1)}</td>
                        <td className={cellClass(true)}>{formatNumber(s?.max, 1)}</td>
                      </tr>
                    );
                  })}
                </SimpleTable>
              </div>
            </Panel>
            <Panel title="Welch's t-test for each pair">
              <SimpleTable caption="Pairwise Welch tests of mean delivered capacity" headers={headersOf("Pair", "Difference#", "95 % interval#", "t#", "df#", "p#")}>
                {comparison.pairs.map((p) => (
                  <tr key={`${p.a}-${p.b}`}>
                    <td className={`${cellClass()} font-mono`}>
                      {lotOf.get(p.a)} − {lotOf.get(p.b)}
                    </td>
                    <td className={cellClass(true)}>{p.welch ? formatMah(p.welch.difference) : "—"}</td>
                    <td className={cellClass(true)}>{p.welch ? `${formatNumber(p.welch.interval.low, 1)} to ${formatNumber(p.welch.interval.high, 1)}` : "—"}</td>
                    <td className={cellClass(true)}>{formatNumber(p.welch?.t, 3)}</td>
                    <td className={cellClass(true)}>{formatNumber(p.welch?.df, 1)}</td>
                    <td className={cellClass(true)}>{p.welch ? (p.welch.p < 0.0001 ? "< 0.0001" : formatNumber(p.welch.p, 4)) : "needs 2 cells each"}</td>
                  </tr>
                ))}
              </SimpleTable>
              <p className="mt-3 text-xs text-ink-soft">
                Welch&apos;s unequal-variance t-test (Welch 1947; degrees of freedom by Welch–Satterthwaite; e-Handbook §7.3.1), two-sided; the same test as R&apos;s default t.test. With several pairs, some small p-values arise by chance alone.
              </p>
            </Panel>
          </>
        )}
      </div>
    </>
  );
}
