import { Facts } from "@/components/ui/facts";
import type { CellHealth } from "@/lib/db/queries/fade";
import { formatMah, formatNumber, formatPercent } from "@/lib/notebook/format";
import type { Estimate } from "@/lib/stats";

const estimate = (e: Estimate, decimals: number, unit: string) =>
  `${formatNumber(e.value, decimals)} ± ${formatNumber(e.standardError, decimals)} ${unit} (95 % interval ${formatNumber(e.low, decimals)} to ${formatNumber(e.high, decimals)})`;

export function FadeFacts({ health }: { health: CellHealth }) {
  const f = health.fade?.fade;
  if (!f) return null;
  const last = f.points[f.points.length - 1];
  const byCycle = f.byCycle;
  const eol = byCycle.ok ? byCycle.eol : null;
  const items = [
    { label: "Latest capacity", value: formatMah(last?.capacity_mAh) },
    { label: "State of health, of rated", value: `${formatPercent(last?.sohRated)} of ${health.ratedCapacityMah} mAh` },
    { label: "State of health, of first measurement", value: `${formatPercent(last?.sohFirst)} of ${formatMah(f.firstCapacity_mAh)}` },
    { label: "Full cycles counted", value: String(health.measurements.totalCycles) },
    { label: "End of life at", value: `${health.eolThresholdPct} % of rated = ${formatMah(f.eolCapacity_mAh)}` },
    {
      label: "Fade per 100 cycles",
      value: byCycle.ok ? estimate(byCycle.lossPer100Cycles_mAh, 1, "mAh") : byCycle.reason,
    },
    {
      label: "Fade per 100 cycles, of rated",
      value: byCycle.ok ? estimate(byCycle.lossPer100Cycles_pctRated, 2, "%") : "—",
    },
    { label: "Line fit", value: byCycle.ok ? `R² ${formatNumber(byCycle.rSquared, 3)}, residual SD ${formatMah(byCycle.residualSd_mAh)}, n = ${byCycle.n}` : "—" },
    {
      label: "End-of-life cycle",
      value: eol
        ? eol.ok
          ? `${eol.reached ? "reached; line crosses at " : ""}cycle ${formatNumber(eol.cycle, 0)}${eol.interval ? ` (95 % interval ${formatNumber(eol.interval.low, 0)} to ${formatNumber(eol.interval.high, 0)})` : " (interval open: the fade rate's interval includes zero)"}`
          : eol.reason
        : "—",
    },
    {
      label: "End-of-life date",
      value: f.eolDate.ok
        ? `${f.eolDate.date.slice(0, 10)}${f.eolDate.interval ? ` (${f.eolDate.interval.low.slice(0, 10)} to ${f.eolDate.interval.high.slice(0, 10)})` : ""}, by ${f.eolDate.basis === "cycle-on-date" ? `${formatNumber(f.eolDate.cyclesPerDay, 2)} cycles a day so far` : "capacity against date"}`
        : f.eolDate.reason,
    },
  ];
  return <Facts items={items} />;
}

export function KneeFacts({ health }: { health: CellHealth }) {
  const knee = health.fade?.knee;
  if (!knee) {
    return <p className="text-sm text-ink-soft">The knee test needs at least 10 capacity points on the cycle axis; this cell has {health.measurements.capacity.length}.</p>;
  }
  return (
    <>
      <Facts
        items={[
          { label: "Verdict", value: knee.significant ? `Knee at cycle ${formatNumber(knee.knee, 0)}` : "No significant knee" },
          { label: "Knee onset", value: knee.onset === null ? "—" : `cycle ${formatNumber(knee.onset, 0)}` },
          { label: "Slope before → after", value: `${formatNumber(knee.slopeBefore * 100, 2)} → ${formatNumber(knee.slopeAfter * 100, 2)} mAh per 100 cycles` },
          { label: "F-test against a straight line", value: `F = ${formatNumber(knee.fStatistic, 2)}, p = ${formatNumber(knee.pValue, 4)}` },
        ]}
      />
      <p className="mt-3 text-xs text-ink-soft">{knee.rule}</p>
    </>
  );
}
